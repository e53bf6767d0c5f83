package contact

import "math"

// A bounce from within the slop.
//
// A point that arrives within its slop of the surface bounces at once,
// from where it is (impacts), a gap sep short of the surface. Newton's
// law of restitution (W. Goldsmith, "Impact", 1960, chapter 1) acts at the
// surface: the bodies arrive there at the approach a0 grown by the step's
// forces over the gap, ac = sqrt(a0^2 + 2 G sep) (arrivalSpeed, with G the
// forces' approach acceleration), and leave at e ac. Leaving at e a0 from
// a gap sep instead rose (1 - e^2) sep too high: with the slop a hundredth
// of a small part's radius, a 1 mm ball's third rebound at e = 0.5 came
// out 6 percent high where a 1 m ball's, whose slop is a smaller part of
// it, was exact (measured; dimensional analysis makes the two the same
// case). So the bounce leaves the gap at the speed that reaches the apex
// of a bounce from the surface, energy along the normal under the
// constant forces (which the world integrates exactly):
//
//	v^2 + 2 G sep = (e ac)^2,  v^2 = e^2 a0^2 - 2 G sep (1 - e^2),
//
// or 0 where that is negative: a bounce from the surface that would not
// rise above the gap is a landing, which puts the bodies on the surface
// (landing.go).
//
// A bounce found already inside the surface, at a depth d = -sep, has the
// mirror error: the bodies crossed the surface at ac = sqrt(a0^2 - 2 G d),
// slower than they move now, and leaving at e a0 from the depth rose
// (1 - e^2) d too low (a 1 mm ball found 0.9 slops deep at e = 0.5 rose
// 1.4 percent of its drop height short of e^2, measured). The same energy
// balance with sep < 0 gives the speed that reaches the apex of the bounce
// from the surface, v^2 = e^2 a0^2 + 2 G d (1 - e^2). Only the depth that
// the approach made in the last step counts, d <= a0 dt (the bodies moved
// a0 dt along the normal in it): a part resting sunk within its slop, hit
// slowly, did not fall through its depth, and counting that depth sent it
// back at its approach, as if elastic, so that parts that should rest went
// on rocking. The speed is capped at a0, which it reaches only when the
// approach is below 2 G dt: no bounce leaves faster than it came.

// gapRebound is the speed at which a point sep (m; > 0 in a gap, < 0
// inside) from the surface, approaching at a0 (m/s) before this step's
// forces, which add fd to the approach over the step dt, leaves it with
// restitution e.
func gapRebound(e, a0, fd, sep, dt float64) float64 {
	g := fd / dt
	sep = max(sep, -a0*dt) // inside: the depth the last step made
	v2 := min(e*e*a0*a0-2*g*sep*(1-e*e), a0*a0)
	if !(v2 > 0) {
		return 0
	}
	return math.Sqrt(v2)
}
