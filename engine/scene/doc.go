// Package scene reads scene files: TOML documents that describe a world
// (gravity, time step, materials, bodies, kicks and an optional study
// section) in the units their author chose, and turns them into an
// engine.World in SI units.
//
// Every quantity in a scene is a plain number in the file's units
// (units = { length, mass }, default m and kg; time always s, angles
// degrees, angular velocity rad/s) or a string with its own unit, such
// as "30 in", "1.2 g/cm3" or "9.81 m/s2".
//
// Input is strict: unknown keys are refused with the nearest valid key
// suggested, and every value is checked. Every error names the file and
// line, and the body or material it concerns, and says what to do; bad
// input never panics. The Scene keeps the input's units so that result
// writers can convert back.
package scene
