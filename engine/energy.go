package engine

import (
	"math"

	"clatter/shapes"
)

// KineticEnergy is the total kinetic energy of the dynamic bodies, J.
func (w *World) KineticEnergy() float64 {
	e := 0.0
	for i := range w.b.kind {
		e += w.kinetic(BodyID(i))
	}
	return e
}

// spinEnergy is a dynamic body's rotational kinetic energy.
func (w *World) spinEnergy(id BodyID) float64 {
	q := qmul(&w.b.rot[id], &w.b.axes[id])
	wb := qrotateInv(&q, &w.b.spin[id])
	m := w.b.moments[id]
	return 0.5 * (m[0]*wb[0]*wb[0] + m[1]*wb[1]*wb[1] + m[2]*wb[2]*wb[2])
}

func (w *World) kinetic(id BodyID) float64 {
	if w.b.kind[id] != Dynamic {
		return 0
	}
	v := w.b.vel[id]
	return 0.5*w.b.mass[id]*v.Dot(v) + w.spinEnergy(id)
}

// PotentialEnergy is the gravitational potential energy of the dynamic
// bodies relative to the world origin, -m g . x, J.
func (w *World) PotentialEnergy() float64 {
	e := 0.0
	for i := range w.b.kind {
		if w.b.kind[i] == Dynamic {
			e -= w.b.mass[i] * w.cfg.Gravity.Dot(w.b.pos[i])
		}
	}
	return e
}

// Energy is kinetic plus potential energy of the dynamic bodies, J.
func (w *World) Energy() float64 { return w.KineticEnergy() + w.PotentialEnergy() }

// LinearMomentum is the total momentum of the dynamic bodies, kg m/s.
func (w *World) LinearMomentum() shapes.Vec3 {
	var p shapes.Vec3
	for i := range w.b.kind {
		if w.b.kind[i] == Dynamic {
			p = p.Add(w.b.vel[i].Mul(w.b.mass[i]))
		}
	}
	return p
}

// AngularMomentum is the total angular momentum of the dynamic bodies about
// the point o: sum of (x - o) x m v + I w, kg m^2/s.
func (w *World) AngularMomentum(o shapes.Vec3) shapes.Vec3 {
	var l shapes.Vec3
	for i := range w.b.kind {
		if w.b.kind[i] != Dynamic {
			continue
		}
		id := BodyID(i)
		in, _ := w.inertiaWorld(id)
		l = l.Add(w.b.pos[i].Sub(o).Cross(w.b.vel[i].Mul(w.b.mass[i]))).Add(in.Mul3x1(w.b.spin[i]))
	}
	return l
}

// preSolveSteps is how many steps back the energy guard looks for the
// energy that deferred impacts hold back: an impact is deferred for one
// step, but in a pile one stop after another can keep some energy held for
// a few steps (seen: two steps in a bin of bouncing parts with e = 1).
const preSolveSteps = 4

// preSolveLog keeps the energies before the contact solve of the last
// preSolveSteps steps; a zero log has seen nothing.
type preSolveLog struct {
	e [preSolveSteps]float64
	n int // entries written so far
}

func (l *preSolveLog) add(e float64) {
	l.e[l.n%preSolveSteps] = e
	l.n++
}

// max is the largest energy logged, or -Inf when none is. (The built-in
// max treats NaN and signed zeros as math.Max does, inline.)
func (l *preSolveLog) max() float64 {
	m := math.Inf(-1)
	for i := 0; i < min(l.n, preSolveSteps); i++ {
		m = max(m, l.e[i])
	}
	return m
}
