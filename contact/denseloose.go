package contact

// Loose points in a dense solve.
//
// An island of more than maxFrictionBlock points whose points other than
// its loose ones (band.go: a pair apart beyond the slop that did not press
// last step) are few enough for the dense solve with friction is the
// island of a few small parts at a coarse step: the speculative margin,
// g dt^2 (11 mm at 1/30 s), reaches from a 1 mm cube to the floor and to
// cubes two rows away. A pyramid of three rows of 1 mm cubes has 36
// touching points and 40 such loose ones at 1/30 s.
//
// Left out of its system, the loose points kept whatever impulse this
// step's pre-solve of their new pair and the sweeps gave them, a load the
// direct solve worked around: the sweeps after it, slow between a heavy and
// a light cube, left speculative points pressing, they counted as pressed
// at the next step, and the system then ran out of pivots and was left to
// the sweeps (a pyramid light on heavy 1:1000 fell 2.7 mm in 3 s at
// 1/30 s). With
// equal masses the normal rows alone were solved before the sweeps, whose
// friction left the faces' corners pressing unevenly; the final solve with
// friction then failed, the patches settled alone (settlePatches) and
// spun the cubes (fell 2.9 mm in 3 s at 1/30 s; measured at 49e4f7f).
//
// If the whole island is within MaxBlock points, its loose points
// therefore join the dense system as normal rows without friction, free at
// the start (they are apart), so that the direct solve gives them the
// impulse the contact needs, none where the parts rest; and the island is
// treated as a banded one is: solved with friction before the sweeps
// (whatever its masses), refined (refine.go), and its released friction
// taken back where the solution holds (blockstick.go). Three rows of
// 1 mm cubes, equal masses and 1000:1 either way, with friction 0.3 to 1
// and restitution up to 0.9, stand within 1e-5 of a cube at 1/30 and
// 1/60 s for 3 s, the ones tried for 10 s too (measured; one exception,
// heavy on light with friction 0.3 at 1/30 s, settles 29 nm in one step
// and stays there).

// denseLoose reports whether the system of points idx, whose first nf
// points may bring friction rows, holds loose points as normal rows only.
func denseLoose(idx []int32, nf int) bool { return nf < len(idx) }
