// Package testdata holds parts, broken files and scenes used by the tests,
// and the generator that writes the parts (see gen/).
package testdata
