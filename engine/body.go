package engine

import (
	"errors"
	"fmt"
	"math"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Kind says how a body moves.
type Kind uint8

const (
	// Dynamic bodies move under gravity, kicks and contact.
	Dynamic Kind = iota
	// Static bodies never move: floors, walls, fixtures.
	Static
	// Kinematic bodies move with a prescribed velocity and are not pushed by
	// contact; they push dynamic bodies.
	Kinematic
)

func (k Kind) String() string {
	switch k {
	case Dynamic:
		return "dynamic"
	case Static:
		return "static"
	case Kinematic:
		return "kinematic"
	}
	return fmt.Sprintf("Kind(%d)", uint8(k))
}

// BodyID addresses a body of a world; ids are dense and stable.
type BodyID int32

// BodyDef describes a body to add to a world.
type BodyDef struct {
	Name  string
	Kind  Kind
	Shape shapes.Shape
	// Material is the index returned by World.AddMaterial (0 is the default material).
	Material int
	// Mass properties of a dynamic body: either Density (kg/m^3), giving the
	// shape's own mass properties, or Mass (kg) to scale them to a total, or
	// Props to give them outright (for a mesh part whose solid differs from
	// its contact hull). Props.Center is in the shape's frame.
	Density float64
	Mass    float64
	Props   *shapes.Mass
	// Position is the centre of mass of a dynamic body, or where the shape's
	// origin goes for a static or kinematic one. Orientation turns the
	// shape's own axes (zero value: identity).
	Position    shapes.Vec3
	Orientation shapes.Quat
	// Velocity (m/s) and Spin (rad/s, world frame) at the start.
	Velocity, Spin shapes.Vec3
	// Category and Mask filter contacts: two bodies touch only if each one's
	// category is in the other's mask. Zero means all bits.
	Category, Mask uint32
}

// bodyData holds the per-body state in slices indexed by BodyID.
type bodyData struct {
	name   []string
	kind   []Kind
	shape  []shapes.Shape
	mat    []int32
	offset []shapes.Vec3 // shape origin in the body frame (minus the centre of mass)
	pos    []shapes.Vec3 // centre of mass (dynamic) or shape origin (otherwise)
	rot    []shapes.Quat // body frame = shape axes
	vel    []shapes.Vec3
	spin   []shapes.Vec3 // world frame
	mass   []float64
	invM   []float64
	// Principal inertia: axes as a rotation from principal to shape axes and
	// the moments about them. Free rotation is integrated in this frame.
	axes    []shapes.Quat
	moments []shapes.Vec3
	radius  []float64 // bounding radius about the centre of mass, for margins
	bounds  []shapes.AABB
	awake   []bool
	restFor []float64 // time the body has been below the rest thresholds
	maxHit  []float64 // largest impact speed seen
}

// truncate drops the bodies from n on, undoing a failed AddBody.
func (b *bodyData) truncate(n int) {
	b.name, b.kind, b.shape, b.mat = b.name[:n], b.kind[:n], b.shape[:n], b.mat[:n]
	b.offset, b.pos, b.rot, b.vel, b.spin = b.offset[:n], b.pos[:n], b.rot[:n], b.vel[:n], b.spin[:n]
	b.mass, b.invM, b.axes, b.moments = b.mass[:n], b.invM[:n], b.axes[:n], b.moments[:n]
	b.radius, b.bounds, b.awake, b.restFor, b.maxHit = b.radius[:n], b.bounds[:n], b.awake[:n], b.restFor[:n], b.maxHit[:n]
}

// ErrBadBody is wrapped by every error that rejects a BodyDef.
var ErrBadBody = errors.New("bad body")

func finiteVec(v shapes.Vec3) bool {
	for _, c := range v {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return false
		}
	}
	return true
}

func (w *World) bodyErr(def *BodyDef, format string, args ...any) error {
	return fmt.Errorf("%w %q: %s", ErrBadBody, def.Name, fmt.Sprintf(format, args...))
}

// AddBody adds a body and returns its id. Bodies cannot be added during a step.
func (w *World) AddBody(def BodyDef) (BodyID, error) {
	if def.Shape == nil {
		return -1, w.bodyErr(&def, "no shape")
	}
	if def.Material < 0 || def.Material >= len(w.materials) {
		return -1, w.bodyErr(&def, "unknown material index %d", def.Material)
	}
	q := def.Orientation
	if q == (shapes.Quat{}) {
		q = mgl64.QuatIdent()
	}
	if l := q.Len(); !(l > 0) || math.IsNaN(l) || math.IsInf(l, 0) {
		return -1, w.bodyErr(&def, "orientation is not a rotation: %v", q)
	}
	q = q.Normalize()
	for _, v := range []shapes.Vec3{def.Position, def.Velocity, def.Spin} {
		if !finiteVec(v) {
			return -1, w.bodyErr(&def, "position, velocity and spin must be finite numbers")
		}
	}
	_, isPlane := def.Shape.(shapes.Plane)
	_, isMesh := def.Shape.(*shapes.TriMesh)
	if def.Kind == Dynamic && (isPlane || isMesh) {
		return -1, w.bodyErr(&def, "a plane or a triangle mesh can only be static or kinematic; use a convex hull for a moving part")
	}
	var props shapes.Mass
	if def.Kind == Dynamic {
		switch {
		case def.Props != nil:
			props = *def.Props
		case def.Mass != 0:
			if !(def.Mass > 0) || math.IsInf(def.Mass, 0) {
				return -1, w.bodyErr(&def, "mass must be positive, got %g", def.Mass)
			}
			props = massOf(def.Shape, 1).WithMass(def.Mass)
		default:
			if !(def.Density > 0) || math.IsInf(def.Density, 0) {
				return -1, w.bodyErr(&def, "density must be positive, got %g (give a density or a mass)", def.Density)
			}
			props = massOf(def.Shape, def.Density)
		}
		if !(props.Mass > 0) || math.IsInf(props.Mass, 0) {
			return -1, w.bodyErr(&def, "mass must be positive and finite, got %g", props.Mass)
		}
	}
	id := BodyID(len(w.b.kind))
	b := &w.b
	b.name = append(b.name, def.Name)
	b.kind = append(b.kind, def.Kind)
	b.shape = append(b.shape, w.prepareShape(def.Shape))
	b.mat = append(b.mat, int32(def.Material))
	b.pos = append(b.pos, def.Position)
	b.rot = append(b.rot, q)
	b.vel = append(b.vel, def.Velocity)
	b.spin = append(b.spin, def.Spin)
	b.awake = append(b.awake, def.Kind != Static)
	b.restFor = append(b.restFor, 0)
	b.maxHit = append(b.maxHit, 0)
	if def.Kind == Dynamic {
		moments, axes, err := w.principal(props.Inertia) // worked out once (reuse.go)
		if err != nil {
			return -1, w.bodyErr(&def, "%v", err)
		}
		if !(moments[0] > 0) {
			return -1, w.bodyErr(&def, "inertia must be positive, got principal moments %v", moments)
		}
		b.offset = append(b.offset, props.Center.Mul(-1))
		b.mass = append(b.mass, props.Mass)
		b.invM = append(b.invM, 1/props.Mass)
		b.axes = append(b.axes, mgl64.Mat4ToQuat(axes.Mat4()).Normalize())
		b.moments = append(b.moments, moments)
	} else {
		b.offset = append(b.offset, shapes.Vec3{})
		b.mass = append(b.mass, 0)
		b.invM = append(b.invM, 0)
		b.axes = append(b.axes, mgl64.QuatIdent())
		b.moments = append(b.moments, shapes.Vec3{})
	}
	r := 0.0
	if lb := def.Shape.Bounds(); finiteVec(lb.Min) && finiteVec(lb.Max) {
		for k := 0; k < 8; k++ {
			c := lb.Min
			for a := 0; a < 3; a++ {
				if k&(1<<a) != 0 {
					c[a] = lb.Max[a]
				}
			}
			r = math.Max(r, c.Add(b.offset[id]).Len())
		}
	}
	b.radius = append(b.radius, r)
	b.bounds = append(b.bounds, shapes.AABB{})
	cat, mask := def.Category, def.Mask
	if cat == 0 {
		cat = ^uint32(0)
	}
	if mask == 0 {
		mask = ^uint32(0)
	}
	if err := w.addToBroadPhase(id, cat, mask); err != nil {
		w.b.truncate(int(id))
		return -1, w.bodyErr(&def, "its shape has no valid bounds (%v); is it empty?", err)
	}
	return id, nil
}

// massOf returns a shape's mass properties for a density.
func massOf(s shapes.Shape, density float64) shapes.Mass {
	switch c := s.(type) {
	case shapes.Convex:
		return c.Mass(density)
	case *shapes.Compound:
		return c.Mass(density)
	}
	return shapes.Mass{}
}

// NumBodies is the number of bodies in the world.
func (w *World) NumBodies() int { return len(w.b.kind) }

// Name returns a body's name.
func (w *World) Name(id BodyID) string { return w.b.name[id] }

// KindOf returns a body's kind.
func (w *World) KindOf(id BodyID) Kind { return w.b.kind[id] }

// Shape returns a body's shape; a static *shapes.TriMesh comes back as the
// *collide.Mesh built from it (its TriMesh method returns the original).
func (w *World) Shape(id BodyID) shapes.Shape { return w.b.shape[id] }

// Position returns a body's centre of mass (dynamic) or shape origin.
func (w *World) Position(id BodyID) shapes.Vec3 { return w.b.pos[id] }

// Orientation returns the rotation of a body's shape axes.
func (w *World) Orientation(id BodyID) shapes.Quat { return w.b.rot[id] }

// Velocity returns a body's linear velocity (of its centre of mass).
func (w *World) Velocity(id BodyID) shapes.Vec3 { return w.b.vel[id] }

// Spin returns a body's angular velocity in the world frame.
func (w *World) Spin(id BodyID) shapes.Vec3 { return w.b.spin[id] }

// MassOf returns a body's mass (0 for static and kinematic bodies).
func (w *World) MassOf(id BodyID) float64 { return w.b.mass[id] }

// Awake reports whether a body has not fallen asleep (a napping body, whose
// rest time has not run out, counts as awake: nap.go).
func (w *World) Awake(id BodyID) bool { return w.b.awake[id] || w.napping(id) }

// MaxImpactSpeed returns the largest normal approach speed of an impact on the body so far.
func (w *World) MaxImpactSpeed(id BodyID) float64 { return w.b.maxHit[id] }

// ShapePose returns where a body's shape frame is in the world.
func (w *World) ShapePose(id BodyID) shapes.Pose {
	q := w.b.rot[id]
	return shapes.Pose{Position: w.b.pos[id].Add(qrotate(&q, &w.b.offset[id])), Orientation: q}
}

// SetVelocity sets a body's linear and angular velocity and wakes it.
func (w *World) SetVelocity(id BodyID, v, spin shapes.Vec3) {
	w.b.vel[id], w.b.spin[id] = v, spin
	w.wake(id)
}

// SetPose moves a body (centre of mass for a dynamic body) and wakes it.
func (w *World) SetPose(id BodyID, position shapes.Vec3, orientation shapes.Quat) {
	w.b.pos[id], w.b.rot[id] = position, orientation.Normalize()
	w.active.poseAll = true // (active.go)
	if w.b.kind[id] == Static {
		w.staticMoved(id) // what slept on it, or sleeps where it now is, wakes (support.go)
	}
	w.wake(id)
}

// inertiaWorld returns a dynamic body's inertia tensor and its inverse in
// the world frame.
func (w *World) inertiaWorld(id BodyID) (in, inv shapes.Mat3) {
	r := shapes.RotationMatrix(qmul(&w.b.rot[id], &w.b.axes[id]))
	m := w.b.moments[id]
	d := shapes.Mat3{m[0], 0, 0, 0, m[1], 0, 0, 0, m[2]}
	di := shapes.Mat3{1 / m[0], 0, 0, 0, 1 / m[1], 0, 0, 0, 1 / m[2]}
	rt := r.Transpose()
	return r.Mul3(d).Mul3(rt), r.Mul3(di).Mul3(rt)
}

// invInertiaWorld is inertiaWorld's inverse alone, computed the same way
// (mat3Mul is Mat3.Mul3's arithmetic).
func (w *World) invInertiaWorld(id BodyID) shapes.Mat3 {
	r := shapes.RotationMatrix(qmul(&w.b.rot[id], &w.b.axes[id]))
	m := w.b.moments[id]
	di := shapes.Mat3{1 / m[0], 0, 0, 0, 1 / m[1], 0, 0, 0, 1 / m[2]}
	rt := r.Transpose()
	rd := mat3Mul(&r, &di)
	return mat3Mul(&rd, &rt)
}
