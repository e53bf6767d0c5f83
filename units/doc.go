// Package units is the one table of the units of measure that clatter
// reads: each unit's name, its size in SI (radians for angles) and its
// dimension. Scene files (engine/scene), STL files (shapes/mesh) and the
// command's flags all look units up here, so that "mm" or "in" means the
// same thing everywhere.
//
// Dimensions are exponents of length, mass, time and angle (Dim). The
// grammar of quantities such as "1.2 g/cm3" is the scene reader's; this
// package only names the units.
package units
