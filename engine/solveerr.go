package engine

import (
	"fmt"
	"math"
)

// solveError turns an error of the contact solver, which knows bodies by
// index and points by key, into a divergence that names the bodies and
// their materials: it finds the first contact point or joint row whose
// numbers are no longer finite, which is what the solver refuses after a
// blow-up within the step.
func (w *World) solveError(err error) error {
	c := &w.collision
	a, b, what := int32(-1), int32(-1), ""
	for i := range c.points {
		p := &c.points[i]
		if !finiteVec(p.Position) || !finiteVec(p.Normal) || !finiteVec(p.SurfaceVelocity) || !finite(p.Separation) ||
			!finite(p.Friction+p.StaticFriction+p.Restitution) {
			a, b, what = p.A, p.B, "their contact point is no longer a finite number"
			break
		}
	}
	for j := range c.rows {
		if a >= 0 {
			break
		}
		r := &c.rows[j]
		if !finiteVec(r.LinA) || !finiteVec(r.AngA) || !finiteVec(r.LinB) || !finiteVec(r.AngB) || !finite(r.Target+r.Drift) {
			a, b, what = r.A, r.B, "the joint between them is no longer a finite number"
		}
	}
	const advice = "the step is likely too large for the sizes and speeds in the scene (try a smaller step or more sub-steps)"
	if a < 0 || b < 0 || int(a) >= len(w.b.kind) || int(b) >= len(w.b.kind) {
		return fmt.Errorf("simulation diverged at t = %.6g s in the contact solve: %w; %s", w.time, err, advice)
	}
	body := a
	if w.b.kind[a] != Dynamic {
		body = b
	}
	return &DivergenceError{Body: BodyID(body), Name: w.b.name[body], Time: w.time,
		Cause: fmt.Sprintf("in the contact solve between %s and %s, %s; %s", w.describeBody(a), w.describeBody(b), what, advice)}
}

// describeBody names a body and its material for messages.
func (w *World) describeBody(i int32) string {
	s := fmt.Sprintf("body %q", w.b.name[i])
	if m := int(w.b.mat[i]); m >= 0 && m < len(w.materials) && w.materials[m].Name != "" {
		s += fmt.Sprintf(" (material %q)", w.materials[m].Name)
	}
	return s
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
