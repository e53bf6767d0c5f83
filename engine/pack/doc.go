// Package pack names the faces, edges and corners of a package the way
// packaging drop-test standards do, and works out what a drop test needs:
// the orientation that presents a named feature to the floor, the drop
// height the parcel procedures prescribe for a mass, the ten-drop sequence,
// and which feature of a body an impact struck.
//
// Faces are numbered on a body's box of bounds in its own axes, as ASTM
// D5276 ("Standard Test Method for Drop Test of Loaded Containers by Free
// Fall") and the ISTA procedures identify the faces of a package: 1 top
// (+z), 2 right side (-y), 3 bottom (-z), 4 left side (+y), 5 near end
// (-x), 6 far end (+x). An edge is named by its two faces ("edge 3-5"), a
// corner by its three ("corner 2-3-5"), numbers in increasing order.
//
// Simulation informs the design of a package; it does not replace the
// drop, vibration and stability tests that the standards and carriers
// require.
package pack
