package engine

import (
	"fmt"
	"math"

	"clatter/collide"
	"clatter/shapes"
)

// Compliant contact. A contact whose pair of materials has a stiffness is
// not a rigid constraint row: its force is a spring and a dashpot computed
// from the indentation, applied as an impulse each step, and the bodies are
// integrated through the contact with steps short enough to follow it.
//
// Why forces and not solver rows: the rigid solver removes penetration and
// makes an impact an instant; a cushion is the opposite, its indentation is
// the physics. The engine's step is kick then drift (velocities from the
// forces at the start of the step, then positions from the new
// velocities): for a force that depends on position only this is the
// leapfrog (Stormer-Verlet) scheme, second order in the positions and
// symplectic (Hairer, Lubich and Wanner, "Geometric numerical integration
// illustrated by the Stormer-Verlet method", Acta Numerica 12, 2003), so the
// peak indentation and force converge as the square of the sub-step.
// Dashpots are taken implicitly at each point, which keeps even a heavily
// damped contact stable.
//
// Friction on a compliant contact stays Coulomb's: at each point an impulse
// against the slip, bounded by the friction coefficient times the spring's
// normal impulse and never larger than the impulse that stops the slip (so
// friction cannot reverse the motion it opposes; a stuck point stays stuck
// while the static coefficient allows).

// stepsPerPeriod is the number of sub-steps per natural period of the
// stiffest compliant contact (about 50 per impact, which lasts half a
// period). With the second-order scheme above the peak force is then within
// about (2 pi / 100)^2 / 24 = 0.02 percent, and reading the peak at sub-step
// instants loses at most 1 - cos(pi / 100) = 0.05 percent.
const stepsPerPeriod = 100

// maxSoftSubSteps bounds the sub-steps of one step: beyond it the scene's
// step is too coarse for its stiffness and the run stops and says so.
const maxSoftSubSteps = 200000

// softState holds the compliant contacts of a world.
type softState struct {
	on       bool        // some pair of materials is compliant
	laws     []springLaw // n x n beside the pair table (stiffness.go)
	h        float64     // the step being split into sub-steps, s
	n        int         // the sub-steps it was split into
	last     float64     // the sub-step last used, s
	lastH    float64     // the step of the last applySoft, s
	pts      []softPoint
	contacts []softContact
	force    []shapes.Vec3 // net compliant force on each body this sub-step, N
	peak     []float64     // largest net compliant force over weight, g
	jn       []float64     // normal impulse of each point of the pair in hand
}

// softPoint is a contact point of a compliant pair this step.
type softPoint struct {
	a, b                 BodyID
	law                  int
	pos, n               shapes.Vec3
	sep                  float64
	friction, staticFric float64
	restitution          float64
}

// softContact is one compliant contact between two bodies, from the step
// its indentation began until it ends.
type softContact struct {
	a, b          BodyID
	start, v0     float64 // time and normal approach speed when it began
	point, normal shapes.Vec3
	poses         [2]shapes.Pose // the bodies' shape poses when it began
	peakF         float64        // largest contact force, N
	impulse       float64        // normal impulse so far, N s
	peakG         [2]float64     // largest contact force over weight, per body
	lastT, lastD  float64        // time, deepest indentation and rate at the
	lastRate      float64        // last sub-step, to find when it ended
	restoring     bool           // past the deepest indentation
	done          bool           // the impact is reported; the bodies may still touch
	seen          bool
}

// softLookAhead widens a body's speculative margin in a world with
// compliant contacts to two whole steps of travel, so that a contact about
// to begin is seen one step early and that step is split finely.
func (w *World) softLookAhead(i int) float64 {
	return 2 * (w.b.vel[i].Len() + w.b.spin[i].Len()*w.b.radius[i]) * w.soft.h
}

// softPair takes the points of a compliant pair out of the rigid solver's
// list and reports whether it did.
func (w *World) softPair(a, b BodyID, ms []collide.Manifold, coef PairCoefficients) bool {
	n := len(w.materials)
	law := int(w.b.mat[a])*n + int(w.b.mat[b])
	if !w.soft.laws[law].compliant() {
		return false
	}
	touch := false
	slop := w.pairSlop(a, b) // (slop.go)
	for _, mf := range ms {
		for k := 0; k < mf.Count; k++ {
			pt := mf.Points[k]
			touch = touch || pt.Separation <= slop
			w.soft.pts = append(w.soft.pts, softPoint{a: a, b: b, law: law, pos: pt.Position, n: mf.Normal,
				sep: pt.Separation, friction: coef.Friction, staticFric: coef.StaticFriction, restitution: coef.Restitution})
		}
	}
	if touch {
		w.collision.touching = append(w.collision.touching, touchPair{a, b})
	}
	return true
}

// softSplit returns how many sub-steps the step h needs for the compliant
// contacts active or about to begin: stepsPerPeriod per natural period
// 2 pi sqrt(m_eff / k) of the stiffest, 1 with none.
func (w *World) softSplit(h float64) (int, error) {
	if !w.soft.on {
		return 1, nil
	}
	w.soft.h = h
	if w.steps == 0 && len(w.soft.pts) == 0 {
		// Nothing has been detected yet: find what touches or is about to
		// before the first step, so that it too is split.
		w.collide(h)
	}
	need, g := 1.0, w.cfg.Gravity.Len()
	for i := range w.soft.pts {
		p := &w.soft.pts[i]
		law := w.soft.laws[p.law]
		// The points are a step old: look two steps ahead.
		closing := w.approach(p) + 2*g*h
		if p.sep > 0 && p.sep-2*closing*h > 0 {
			continue // cannot touch during this step
		}
		if law.err != "" {
			return 0, w.softLawError(p, law)
		}
		mEff := 1 / (w.invMassAt(p.a, p.pos, p.n) + w.invMassAt(p.b, p.pos, p.n))
		// A point of a linear cushion carries its share of the one spring,
		// d / sum d of the pair's indented points (all of it while it is
		// the only one, or not yet touching).
		k := law.k * w.softShare(i)
		if law.eStar > 0 {
			kh, err := w.hertzConstant(p, law)
			if err != nil {
				return 0, err
			}
			// Tangent stiffness 3/2 K sqrt(d) at the deepest of: the present
			// indentation, the peak of an impact at the present speed
			// (1/2 m v^2 = 2/5 K d^(5/2)) and the static one (K d^(3/2) = m g).
			d := math.Max(-p.sep, math.Pow(5*mEff*closing*closing/(4*kh), 0.4))
			d = math.Max(d, math.Pow(mEff*g/kh, 2.0/3))
			k = 1.5 * kh * math.Sqrt(d)
		}
		if !(k > 0) || math.IsInf(mEff, 0) || mEff == 0 {
			continue
		}
		period := 2 * math.Pi * math.Sqrt(mEff/k)
		per := float64(stepsPerPeriod)
		if law.k > 0 {
			// A linear dashpot's force jumps at the start and the end of a
			// contact (c v); linearImpulse takes the jumps inside a sub-step,
			// but what is left grows with the damping: a heavily damped
			// cushion (e = 0.05, zeta = 0.69) needs about twice the sub-steps
			// for its rebound to be within 1 percent (TestDampedCushion).
			per *= 1 + 2*dampingRatio(p.restitution)
		}
		need = math.Max(need, math.Ceil(per*h/period))
	}
	if w.softImpactUnderway() {
		// Keep the split of an impact to its end: its force changes fast,
		// and the step is best not changed meanwhile (see shiftHalfStep).
		need = math.Max(need, float64(w.soft.n))
	}
	if need > maxSoftSubSteps {
		p := w.soft.pts[0]
		return 0, fmt.Errorf("at t = %.6g s the compliant contact of %q and %q needs %.0f sub-steps in one step of %g s (more than %d): the stiffness is too high for the step; use a smaller step",
			w.time, w.b.name[p.a], w.b.name[p.b], need, h, maxSoftSubSteps)
	}
	w.soft.n = int(need)
	w.shiftHalfStep(h / need)
	return w.soft.n, nil
}

// shiftHalfStep keeps the kick-then-drift scheme second order when the
// step changes. Its velocities live half a step behind the positions, so
// going from step H to step h the velocity of a body must move by
// a (H - h) / 2, a its acceleration (leapfrog with a variable step; Hairer,
// Lubich and Wanner 2003): gravity plus the compliant contact force of the
// last sub-step (rigid contacts remove any change their rows oppose). The
// split is held fixed while an impact lasts. Without it a body would reach
// a cushion with the speed it had half a coarse step earlier (1 percent of
// the peak at a 10 ms step).
func (w *World) shiftHalfStep(h float64) {
	if w.soft.last != 0 && h != w.soft.last {
		f := (w.soft.last - h) / 2
		for i, k := range w.b.kind {
			if k != Dynamic || !w.b.awake[i] || w.inFlight(i) {
				continue // free flight's velocity is the step end's (flight.go)
			}
			a := w.cfg.Gravity
			if i < len(w.soft.force) {
				a = a.Add(w.soft.force[i].Mul(w.b.invM[i]))
			}
			w.b.vel[i] = w.b.vel[i].Add(a.Mul(f))
		}
	}
	w.soft.last = h
}

// softImpactUnderway reports whether a compliant impact has not yet ended.
func (w *World) softImpactUnderway() bool {
	for i := range w.soft.contacts {
		if !w.soft.contacts[i].done {
			return true
		}
	}
	return false
}

func (w *World) softLawError(p *softPoint, law springLaw) error {
	return fmt.Errorf("bodies %q and %q touch, but their stiffness cannot be resolved: %s", w.b.name[p.a], w.b.name[p.b], law.err)
}

// approach is the normal approach speed of B toward A at a point (> 0 closing).
func (w *World) approach(p *softPoint) float64 {
	return -w.relVelocity(p.a, p.b, p.pos).Dot(p.n)
}

// relVelocity is the velocity of B's material point at x relative to A's.
func (w *World) relVelocity(a, b BodyID, x shapes.Vec3) shapes.Vec3 {
	va := w.b.vel[a].Add(w.b.spin[a].Cross(x.Sub(w.b.pos[a])))
	vb := w.b.vel[b].Add(w.b.spin[b].Cross(x.Sub(w.b.pos[b])))
	return vb.Sub(va)
}

// invMassAt is 1/m + (r x n) . I^-1 (r x n): the inverse of the mass a
// force along n at x meets (0 for a body that does not move by forces).
func (w *World) invMassAt(id BodyID, x, n shapes.Vec3) float64 {
	if w.b.kind[id] != Dynamic {
		return 0
	}
	_, inv := w.inertiaWorld(id)
	rn := x.Sub(w.b.pos[id]).Cross(n)
	return w.b.invM[id] + rn.Dot(inv.Mul3x1(rn))
}

// push applies impulse j at x to B and -j to A.
func (w *World) push(a, b BodyID, x, j shapes.Vec3) {
	for _, s := range [2]struct {
		id BodyID
		j  shapes.Vec3
	}{{a, j.Mul(-1)}, {b, j}} {
		if w.b.kind[s.id] != Dynamic || !w.b.awake[s.id] {
			continue
		}
		w.b.vel[s.id] = w.b.vel[s.id].Add(s.j.Mul(w.b.invM[s.id]))
		_, inv := w.inertiaWorld(s.id)
		w.b.spin[s.id] = w.b.spin[s.id].Add(inv.Mul3x1(x.Sub(w.b.pos[s.id]).Cross(s.j)))
	}
}

// softShare is the share of its pair's spring that point i carries:
// its indentation over the sum of the pair's, 1 if it is not indented.
func (w *World) softShare(i int) float64 {
	pts := w.soft.pts
	d := -pts[i].sep
	if d <= 0 {
		return 1
	}
	lo, hi := i, i
	for lo > 0 && pts[lo-1].a == pts[i].a && pts[lo-1].b == pts[i].b {
		lo--
	}
	for hi+1 < len(pts) && pts[hi+1].a == pts[i].a && pts[hi+1].b == pts[i].b {
		hi++
	}
	sum := 0.0
	for _, p := range pts[lo : hi+1] {
		sum += max(0, -p.sep)
	}
	return d / sum
}
