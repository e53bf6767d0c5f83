// Package demo is the built-in example study of `clatter demo`, embedded
// in the binary: an invented scenario in which a moulded L-bracket drops
// onto a chute, slides off it onto a tray, and comes to rest, run for
// three values of the tray's friction and a few starting orientations.
// It reports the face the part lands on and how long it takes to settle.
package demo
