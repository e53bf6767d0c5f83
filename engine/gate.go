package engine

import (
	"errors"
	"fmt"
	"math"

	"clatter/shapes"
)

// Gates count moving bodies passing a place, as the light barrier at a
// feeder's outlet does. A gate is a plane (a point and a normal), or a
// disc of it; a dynamic body is counted when its centre of mass crosses
// the plane in the normal's direction. The test runs after every step on
// the positions the step ends with, so no crossing is missed however
// coarsely a run's trajectory is sampled, and it allocates nothing once
// the first step has sized its state.

// Gate is a counting plane.
type Gate struct {
	Name string
	// At is a point of the plane; Normal (any length but zero) the
	// direction of the crossings counted.
	At, Normal shapes.Vec3
	// Radius, if positive, counts only crossings within this distance of
	// At (a disc instead of the whole plane).
	Radius float64
}

// Crossing is one passage of a body through a gate.
type Crossing struct {
	Gate int
	Body BodyID
	// Time is when the centre of mass reached the plane, interpolated
	// within the step; Position is there. Velocity and Orientation (of the
	// shape's axes) are those at the end of the step.
	Time        float64
	Position    shapes.Vec3
	Velocity    shapes.Vec3
	Orientation shapes.Quat
}

// ErrBadGate is wrapped by every error that rejects a gate.
var ErrBadGate = errors.New("bad gate")

// gateRearm is the distance behind the plane, as a fraction of a body's
// bounding radius, that a counted body must go back before it can be
// counted again: a part hopping on a vibrating track or rocking at the
// plane jitters across it by far less than its own size, and counting
// each jitter would count one part several times.
const gateRearm = 0.5

// gateState is the gates and where each dynamic body was relative to them.
type gateState struct {
	gates []Gate // normals of unit length
	// dist[g*n+i] is body i's signed distance from gate g at the end of
	// the last step; armed[g*n+i] whether a crossing would count.
	dist      []float64
	armed     []bool
	bodies    int // the bodies dist is sized for
	crossings []Crossing
}

// AddGate adds a counting gate and returns its index.
func (w *World) AddGate(g Gate) (int, error) {
	if !finiteVec(g.At) || !finiteVec(g.Normal) || !(g.Normal.Len() > 0) {
		return 0, fmt.Errorf("%w: gate %q: the point and the normal must be finite and the normal not zero", ErrBadGate, g.Name)
	}
	if !(g.Radius >= 0) || math.IsInf(g.Radius, 0) {
		return 0, fmt.Errorf("%w: gate %q: the radius must be a finite number >= 0 (0: the whole plane), got %g", ErrBadGate, g.Name, g.Radius)
	}
	g.Normal = g.Normal.Normalize()
	w.gates.gates = append(w.gates.gates, g)
	w.gates.bodies = -1 // resized and read at the start of the next step
	return len(w.gates.gates) - 1, nil
}

// Gates returns the world's gates in the order they were added.
func (w *World) Gates() []Gate { return w.gates.gates }

// Crossings returns the gate crossings of the steps since the last call,
// in the order they happened within each step; the slice is reused by the
// next step, so copy what must be kept.
func (w *World) Crossings() []Crossing {
	c := w.gates.crossings
	w.gates.crossings = w.gates.crossings[:0]
	return c
}

// readyGates, at the start of a step, sizes the gate state for the
// current bodies and reads their distances if gates or bodies were added
// since the last step; a body already past a gate is not armed until it
// has gone back behind it.
func (w *World) readyGates() {
	gs := &w.gates
	n := len(w.b.kind)
	if len(gs.gates) == 0 || gs.bodies == n {
		return
	}
	gs.bodies = n
	gs.dist = make([]float64, len(gs.gates)*n)
	gs.armed = make([]bool, len(gs.gates)*n)
	for g := range gs.gates {
		for i := 0; i < n; i++ {
			d := gs.gates[g].Normal.Dot(w.b.pos[i].Sub(gs.gates[g].At))
			gs.dist[g*n+i], gs.armed[g*n+i] = d, d < 0
		}
	}
}

// countGates records the crossings of the step of length dt that has just
// moved the bodies; w.time is still the step's start.
func (w *World) countGates(dt float64) {
	gs := &w.gates
	if len(gs.gates) == 0 {
		return
	}
	n := len(w.b.kind)
	for g := range gs.gates {
		gt := &gs.gates[g]
		for i, k := range w.b.kind {
			if k != Dynamic {
				continue
			}
			j := g*n + i
			d0, d1 := gs.dist[j], gt.Normal.Dot(w.b.pos[i].Sub(gt.At))
			gs.dist[j] = d1
			if !gs.armed[j] {
				gs.armed[j] = d1 < -gateRearm*w.b.radius[i]
				continue
			}
			if !(d0 < 0 && d1 >= 0) {
				continue
			}
			f := d0 / (d0 - d1) // fraction of the step at which the plane is reached
			p := w.b.pos[i].Sub(w.b.vel[i].Mul((1 - f) * dt))
			p = p.Sub(gt.Normal.Mul(gt.Normal.Dot(p.Sub(gt.At)))) // onto the plane
			if gt.Radius > 0 && p.Sub(gt.At).Len() > gt.Radius {
				continue
			}
			gs.armed[j] = false
			gs.crossings = append(gs.crossings, Crossing{Gate: g, Body: BodyID(i), Time: w.time + f*dt,
				Position: p, Velocity: w.b.vel[i], Orientation: w.b.rot[i]})
		}
	}
}
