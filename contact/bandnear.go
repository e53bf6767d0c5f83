package contact

import "math"

// Which gaps a banded solve takes in.
//
// A banded solve leaves a pair out of its system when it is loose
// (band.go): its points apart and without load. What it must leave out are
// the speculative points that reach past a part's neighbours, to the part
// beyond them, which would make a tower's system dense. Those are apart
// by at least the depth of the part between them; a part's own neighbour
// across a small gap is not, and a structure set down with gaps between
// its parts must have those in its system. With the slop alone as the
// mark of a neighbour, a tower of 20 boxes 18 mm high set down with
// 0.47 mm between them (1 percent of their length) had at its first step
// at 1/30 s no point within the slop, so the banded solve took none of its
// 152 points and left the landing to the sweeps, which did not converge:
// the tower leaned by 7e-3 rad and its top box sank 3.6 mm into the boxes
// below (measured).
//
// A point is therefore near, one of a neighbour's, if it is within the
// slop or it is a support across a gap smaller than its bodies' depth
// (reach): the distance along the normal from the centre of each moving
// body to the point, the mean of the two. The gap to a part beyond a
// neighbour of about the same size is at least twice that depth (the
// neighbour's height), while the gap to a neighbour is within it whatever
// the step. A point of a part beyond a neighbour much thinner than itself
// (a sheet between two boxes) is near too, and its system is wider by
// that pair: the budget (bandBudget) decides as before.
//
// A support is a face the step's forces (gravity) press one of the bodies
// onto within the face's friction cone, the faces that can carry the body
// (Meriam and Kraige, "Engineering Mechanics: Statics", chapter 6): the
// face below a box, not the side of its neighbour in a row. The gaps
// between the boxes of a pyramid's rows, 1 percent of their width, were
// near too by their depth alone; in the system they widened its band past
// the budget and left pyramids of ten rows to the sweeps, which let them
// sag by a third of a box's weight at a face (measured). With no forces
// given (Body.DV zero) no gap is a support.

// near reports whether point i is a neighbour's point for the banded
// solve: within its slop, or a support apart by less than its reach.
func (s *Solver) near(i int32) bool {
	ps := &s.pts[i]
	return ps.sep <= ps.slop || ps.sep < ps.reach
}

// reach is the mean depth along unit normal n of the moving bodies of a
// point at lever arms rA, rB and gap sep, if the point is a support at
// friction mu, else 0. A body's depth is the distance from its centre to
// its surface under the point. Where the point lies within the gap (on
// either surface or between them, as the collision's convention has it),
// |n . rA| + |n . rB| is the two depths and the gap; with one moving body
// its depth is |n . r| less at most the gap, which is taken off, so that
// the floor's point on the second box of a tower, apart by the first
// box's height, is not near.
func reach(A, B *Body, rA, rB, n *vec, sep, mu float64) float64 {
	d, k := -max(sep, 0), 0.0
	on := false
	if A.InvMass > 0 {
		d, k = d+math.Abs(dot3(n, rA)), k+1
		on = on || pressedOnto(&A.DV, n, 1, mu)
	}
	if B.InvMass > 0 {
		d, k = d+math.Abs(dot3(n, rB)), k+1
		on = on || pressedOnto(&B.DV, n, -1, mu)
	}
	if k == 0 || !on {
		return 0
	}
	return d / k
}

// pressedOnto reports whether the forces' velocity change dv of a body
// presses it onto the face of unit normal side*n (pointing into the
// body's gap) within the friction cone of mu: its part along that normal
// at least |dv| / sqrt(1 + mu^2), the cosine of the cone's half-angle.
func pressedOnto(dv, n *vec, side, mu float64) bool {
	c := side * dot3(n, dv)
	return c > 0 && c*c*(1+mu*mu) >= dot3(dv, dv)
}
