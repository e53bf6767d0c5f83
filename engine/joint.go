package engine

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"clatter/contact"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Joints. A joint holds body A to its base B (another body, or Ground) and
// becomes a handful of contact.Rows each step, solved in the same
// Gauss-Seidel iterations as the contacts (Catto, "Iterative dynamics with
// temporal coherence", 2005). The rows' velocity targets carry no position
// bias: the drift of a joint is removed by the solver's position pass with
// pseudo-velocities (Row.Correct and Row.Drift), which adds no kinetic energy.
//
// Every quantity of a joint describes A relative to B: a hinge's angle and
// speed are those of A turning about the axis as seen from B, a slider's
// travel that of A's anchor along the axis, and the reaction is what the
// joint does to A.

// JointID addresses a joint of a world; ids are dense and stable.
type JointID int32

// Ground stands for the world itself as the base of a joint: a frame that
// never moves, at the world origin with the world's axes.
const Ground BodyID = -1

// JointKind says which relative motions a joint allows.
type JointKind uint8

const (
	// Revolute (a hinge) lets A turn about one axis through the anchor.
	Revolute JointKind = iota
	// Prismatic (a slider) lets A move along one axis without turning.
	Prismatic
	// Spherical (a ball joint) lets A turn freely about the anchor.
	Spherical
	// Fixed welds A to B.
	Fixed
	// Distance keeps a point of A and a point of B at a fixed distance, or
	// within a range (a rope, a stop).
	Distance
)

func (k JointKind) String() string {
	switch k {
	case Revolute:
		return "revolute"
	case Prismatic:
		return "prismatic"
	case Spherical:
		return "spherical"
	case Fixed:
		return "fixed"
	case Distance:
		return "distance"
	}
	return fmt.Sprintf("JointKind(%d)", uint8(k))
}

// MotorMode says what a joint's motor does.
type MotorMode uint8

const (
	// MotorOff: no motor.
	MotorOff MotorMode = iota
	// MotorSpeed drives the joint's speed toward Speed with at most MaxForce.
	MotorSpeed
	// MotorServo pulls the joint toward Target with a spring of Stiffness
	// and a damper of Damping, at most MaxForce.
	MotorServo
)

// Motor drives the free motion of a revolute or prismatic joint. Its units
// are those of the joint: rad, rad/s and N m for a revolute joint; m, m/s
// and N for a prismatic one.
type Motor struct {
	Mode MotorMode
	// Speed is the target speed of a speed motor.
	Speed float64
	// Target is the servo's target angle or travel (from the joint's zero,
	// the pose at which it was made); Stiffness (N m/rad or N/m) and Damping
	// (N m s/rad or N s/m) are the servo's spring and damper, at least one
	// of them positive.
	Target, Stiffness, Damping float64
	// MaxForce caps the motor's torque or force; it must be positive
	// (math.Inf(1) for no cap).
	MaxForce float64
}

// JointDef describes a joint to add to a world. Geometry is given in the
// world frame at the bodies' current poses; the joint's zero (angle,
// travel) is that pose.
type JointDef struct {
	Name string
	Kind JointKind
	// A is the jointed body; B its base, another body or Ground. At least
	// one of them must be dynamic.
	A, B BodyID
	// Anchor is the joint's point. For a Distance joint it is the point on A
	// and AnchorB the point on B.
	Anchor, AnchorB shapes.Vec3
	// Axis is the hinge axis (Revolute) or the direction of travel
	// (Prismatic); any length but zero. It turns with B.
	Axis shapes.Vec3
	// Limited bounds a revolute joint's angle (rad) or a prismatic joint's
	// travel (m) to [Lower, Upper].
	Limited      bool
	Lower, Upper float64
	// MinLength and MaxLength (m) bound a Distance joint; both zero means
	// rigid at the current distance between the anchors.
	MinLength, MaxLength float64
	// Motor drives a revolute or prismatic joint.
	Motor Motor
	// Friction is a Coulomb torque (N m) or force (N) that resists the free
	// motion of a revolute or prismatic joint.
	Friction float64
	// Collide lets A and B touch each other; by default jointed bodies pass
	// through each other, as linked parts overlap at their pins.
	Collide bool
}

// ErrBadJoint is wrapped by every error that rejects a JointDef or a Motor.
var ErrBadJoint = errors.New("bad joint")

// jointCorrection is the fraction of a joint's predicted position error
// that the position pass removes per step. Contacts remove a fifth of
// their penetration per step to let stacks settle gently; a joint's error
// comes from linearising its constraint over one step, is second order in
// the step, and is best removed at once: at 1 ms steps a pendulum's rod
// then stays within 1e-7 of its length, where a fifth per step would leave
// five times the per-step error standing.
const jointCorrection = 1

// joint is a joint's state: its definition and the anchors, axes and
// reference directions in the body frames, fixed when it was made.
type joint struct {
	def    JointDef
	a, b   BodyID
	ra, rb shapes.Vec3 // anchors in A's and B's frames, from the body's position
	axA    shapes.Vec3 // axis in A's frame
	axB    shapes.Vec3 // axis in B's frame
	refA   shapes.Vec3 // a direction normal to the axis that marks angle zero, in A's frame
	refB   shapes.Vec3 // the same direction in B's frame
	rel0   shapes.Quat // A's orientation in B's frame at angle zero
	length float64     // a rigid distance joint's length

	angle, raw float64 // a revolute joint's unwrapped angle at the last step, and atan2's value then

	first, count int32 // its rows in the step's row list (count 0: skipped this step)
	loop         bool  // closes a loop of moving bodies this step (jointtree.go)
	eqFirst      int32 // its equality rows among them
	eqCount      int32
	basis        eqBasis  // directions of the equality rows this step
	chol         cholesky // how they were decoupled
	node         [6]int32 // the rows of its node in the exact solve
	nodeN        int32
	motorRow     int32       // index of the motor row among its rows, -1 if none
	lever        shapes.Vec3 // A's lever arm to its anchor this step, world
}

// mechanisms holds a world's joints and drivers.
type mechanisms struct {
	joints  []joint
	apart   []uint64 // sorted body pairs (lo<<32 | hi) that joints keep from touching
	motions []motionState
	belt    []shapes.Vec3 // per body (grown on demand): conveyor surface velocity, body frame
	belts   int           // bodies with a nonzero conveyor velocity
	powered bool          // something can add energy: a motor, a driven body, a conveyor
	tree    jointTree     // scratch of the exact joint solve (jointtree.go)
	jbodies []BodyID      // bodies with a joint, each once
	held    []bool        // per body (grown on demand): it has a joint (turning.go)
	predP   []shapes.Vec3 // per body: predicted pose at the end of the step
	predQ   []shapes.Quat
	turn    []turnMemo    // per body: the free rotation predictAll worked out for the step
	rows    []contact.Row // this step's joint rows; the solver gets the swept prefix
	dt      float64       // this step's length
}

func (w *World) jointErr(def *JointDef, format string, args ...any) error {
	return fmt.Errorf("%w %q: %s", ErrBadJoint, def.Name, fmt.Sprintf(format, args...))
}

// frame returns a joint body's position and orientation (Ground: the origin).
func (w *World) frame(id BodyID) (shapes.Vec3, shapes.Quat) {
	if id == Ground {
		return shapes.Vec3{}, mgl64.QuatIdent()
	}
	return w.b.pos[id], w.b.rot[id]
}

func (w *World) bodyLabel(id BodyID) string {
	if id == Ground {
		return "the ground"
	}
	return fmt.Sprintf("body %q", w.b.name[id])
}

func (w *World) checkMotor(def *JointDef, m Motor) error {
	if m.Mode == MotorOff {
		return nil
	}
	if def.Kind != Revolute && def.Kind != Prismatic {
		return w.jointErr(def, "a %s joint has no motor; only revolute and prismatic joints do", def.Kind)
	}
	if !(m.MaxForce > 0) {
		return w.jointErr(def, "motor: the force or torque cap must be positive (infinity for none), got %g", m.MaxForce)
	}
	switch m.Mode {
	case MotorSpeed:
		if math.IsNaN(m.Speed) || math.IsInf(m.Speed, 0) {
			return w.jointErr(def, "motor: speed must be a finite number, got %g", m.Speed)
		}
	case MotorServo:
		if math.IsNaN(m.Target) || math.IsInf(m.Target, 0) {
			return w.jointErr(def, "servo: target must be a finite number, got %g", m.Target)
		}
		for _, v := range []float64{m.Stiffness, m.Damping} {
			if !(v >= 0) || math.IsInf(v, 0) {
				return w.jointErr(def, "servo: stiffness and damping must be finite and >= 0, got %g and %g", m.Stiffness, m.Damping)
			}
		}
		if m.Stiffness == 0 && m.Damping == 0 {
			return w.jointErr(def, "servo: give a stiffness or a damping (both are 0)")
		}
	default:
		return w.jointErr(def, "unknown motor mode %d", m.Mode)
	}
	return nil
}

// AddJoint adds a joint and returns its id.
func (w *World) AddJoint(def JointDef) (JointID, error) {
	if err := w.checkJoint(&def); err != nil {
		return -1, err
	}
	jt, err := w.newJoint(def)
	if err != nil {
		return -1, err
	}
	m := &w.mech
	m.joints = append(m.joints, jt)
	for _, id := range [2]BodyID{def.A, def.B} {
		if id != Ground && !slices.Contains(m.jbodies, id) {
			m.jbodies = append(m.jbodies, id)
			if n := int(id) + 1; len(m.held) < n {
				m.held = append(m.held, make([]bool, n-len(m.held))...)
			}
			m.held[id] = true
		}
	}
	if !def.Collide && def.B != Ground {
		k := pairKey(def.A, def.B)
		if i, found := slices.BinarySearch(m.apart, k); !found {
			m.apart = slices.Insert(m.apart, i, k)
		}
	}
	w.updatePowered()
	w.wake(def.A)
	if def.B != Ground {
		w.wake(def.B)
	}
	return JointID(len(m.joints) - 1), nil
}

// checkJoint refuses a JointDef that names no bodies of the world, joins
// nothing that can move, or asks a kind for what it does not have.
func (w *World) checkJoint(def *JointDef) error {
	n := BodyID(len(w.b.kind))
	if def.Kind > Distance {
		return w.jointErr(def, "unknown kind %d", def.Kind)
	}
	if def.A < 0 || def.A >= n {
		return w.jointErr(def, "body A: no body %d (the world has %d)", def.A, n)
	}
	if def.B != Ground && (def.B < 0 || def.B >= n) {
		return w.jointErr(def, "body B: no body %d (the world has %d; use Ground for the world)", def.B, n)
	}
	if def.A == def.B {
		return w.jointErr(def, "joins body %q to itself", w.b.name[def.A])
	}
	if w.b.kind[def.A] != Dynamic && (def.B == Ground || w.b.kind[def.B] != Dynamic) {
		return w.jointErr(def, "joins %s to %s, and neither is dynamic; a joint needs a body that can move", w.bodyLabel(def.A), w.bodyLabel(def.B))
	}
	if !finiteVec(def.Anchor) || !finiteVec(def.AnchorB) || !finiteVec(def.Axis) {
		return w.jointErr(def, "anchor and axis must be finite numbers")
	}
	free := def.Kind == Revolute || def.Kind == Prismatic
	if free && !(def.Axis.Len() > 0) {
		return w.jointErr(def, "a %s joint needs an axis; got zero", def.Kind)
	}
	if def.Limited {
		if !free {
			return w.jointErr(def, "a %s joint has no angle or travel to limit (use the lengths of a distance joint)", def.Kind)
		}
		if math.IsNaN(def.Lower) || math.IsNaN(def.Upper) || !(def.Lower <= def.Upper) {
			return w.jointErr(def, "limits must satisfy lower <= upper, got %g and %g", def.Lower, def.Upper)
		}
	}
	if def.Friction != 0 {
		if !free {
			return w.jointErr(def, "a %s joint has no free motion for friction to resist", def.Kind)
		}
		if !(def.Friction > 0) || math.IsInf(def.Friction, 0) {
			return w.jointErr(def, "friction must be a finite number >= 0, got %g", def.Friction)
		}
	}
	return w.checkMotor(def, def.Motor)
}

// newJoint makes a checked joint's state: its anchors, axes and reference
// directions in the bodies' frames at their current poses, and a distance
// joint's lengths.
func (w *World) newJoint(def JointDef) (joint, error) {
	pa, qa := w.frame(def.A)
	pb, qb := w.frame(def.B)
	jt := joint{def: def, a: def.A, b: def.B, motorRow: -1}
	anchorB := def.Anchor
	if def.Kind == Distance {
		anchorB = def.AnchorB
		lo, hi := def.MinLength, def.MaxLength
		if !(lo >= 0) || !(hi >= lo) || math.IsInf(hi, 0) {
			return jt, w.jointErr(&def, "lengths must satisfy 0 <= min <= max < infinity, got %g and %g", lo, hi)
		}
		if hi == 0 {
			jt.length = def.AnchorB.Sub(def.Anchor).Len()
			if !(jt.length > 0) {
				return jt, w.jointErr(&def, "the two anchors coincide, so there is no distance to keep; use a spherical joint")
			}
			jt.def.MinLength, jt.def.MaxLength = jt.length, jt.length
		} else if lo == hi {
			jt.length = lo
		}
	}
	jt.ra = qa.Conjugate().Rotate(def.Anchor.Sub(pa))
	jt.rb = qb.Conjugate().Rotate(anchorB.Sub(pb))
	ax := shapes.Vec3{0, 0, 1}
	if def.Kind == Revolute || def.Kind == Prismatic {
		ax = def.Axis.Normalize()
		jt.def.Axis = ax
	}
	ref, _ := perpendiculars(ax)
	jt.axA, jt.axB = qa.Conjugate().Rotate(ax), qb.Conjugate().Rotate(ax)
	jt.refA, jt.refB = qa.Conjugate().Rotate(ref), qb.Conjugate().Rotate(ref)
	jt.rel0 = qb.Conjugate().Mul(qa).Normalize()
	return jt, nil
}

func pairKey(a, b BodyID) uint64 {
	if a > b {
		a, b = b, a
	}
	return uint64(uint32(a))<<32 | uint64(uint32(b))
}

// jointedApart reports whether a joint keeps bodies a and b from touching.
func (w *World) jointedApart(a, b BodyID) bool {
	if len(w.mech.apart) == 0 {
		return false
	}
	_, found := slices.BinarySearch(w.mech.apart, pairKey(a, b))
	return found
}

// NumJoints is the number of joints in the world.
func (w *World) NumJoints() int { return len(w.mech.joints) }

// Joint returns a joint's definition as it is now (axis normalised, a
// rigid distance joint's length filled in, the motor as last set).
func (w *World) Joint(j JointID) JointDef { return w.mech.joints[j].def }

// SetMotor replaces a revolute or prismatic joint's motor from the next
// step on, and wakes its bodies.
func (w *World) SetMotor(j JointID, m Motor) error {
	if j < 0 || int(j) >= len(w.mech.joints) {
		return fmt.Errorf("%w: no joint %d", ErrBadJoint, j)
	}
	jt := &w.mech.joints[j]
	if err := w.checkMotor(&jt.def, m); err != nil {
		return err
	}
	jt.def.Motor = m
	w.updatePowered()
	w.wake(jt.a)
	if jt.b != Ground {
		w.wake(jt.b)
	}
	return nil
}

// JointReaction returns the force (N) and torque (N m) that the joint
// applied to body A during the last step, at A's anchor, in the world
// frame: the constraint, its limits, its motor and its friction together.
// The base B felt the opposite. Zero while the joint's bodies sleep.
func (w *World) JointReaction(j JointID) (force, torque shapes.Vec3) {
	jt := &w.mech.joints[j]
	if jt.count == 0 {
		return shapes.Vec3{}, shapes.Vec3{}
	}
	// Read back from the last step's rows, which stay as the solve left
	// them until the next step builds new ones: most steps nobody asks.
	rows := w.mech.rows
	dt := w.mech.dt
	var f, t shapes.Vec3
	for k := jt.first; k < jt.first+jt.count; k++ {
		r := &rows[k]
		f = f.Add(r.LinA.Mul(r.Impulse))
		t = t.Add(r.AngA.Mul(r.Impulse))
	}
	f, t = f.Mul(1/dt), t.Mul(1/dt)
	// The angular part about A's centre includes the moment of the force
	// at the anchor; what is left is the torque at the anchor.
	return f, t.Sub(jt.lever.Cross(f))
}

// MotorEffort returns the torque (N m) or force (N) of a joint's motor
// during the last step, along the axis, acting on A.
func (w *World) MotorEffort(j JointID) float64 {
	jt := &w.mech.joints[j]
	if jt.count == 0 || jt.motorRow < 0 {
		return 0
	}
	return w.mech.rows[jt.first+jt.motorRow].Impulse / w.mech.dt
}

// JointPosition returns a revolute joint's angle (rad, unwrapped: it counts
// whole turns), a prismatic joint's travel (m) or a distance joint's
// length (m) now; 0 for other kinds.
func (w *World) JointPosition(j JointID) float64 {
	jt := &w.mech.joints[j]
	g := w.jointGeom(jt)
	switch jt.def.Kind {
	case Revolute:
		return jt.angle + wrapAngle(g.raw-jt.raw)
	case Prismatic:
		return g.axis.Dot(g.d)
	case Distance:
		return g.d.Len()
	}
	return 0
}

// JointSpeed returns the rate of JointPosition now (rad/s or m/s); 0 for
// spherical and fixed joints.
func (w *World) JointSpeed(j JointID) float64 {
	jt := &w.mech.joints[j]
	g := w.jointGeom(jt)
	va, wa := w.bodyVel(jt.a)
	vb, wb := w.bodyVel(jt.b)
	// Velocity of A's anchor relative to B's.
	dv := va.Add(wa.Cross(g.rA)).Sub(vb.Add(wb.Cross(g.rB)))
	switch jt.def.Kind {
	case Revolute:
		return g.axis.Dot(wa.Sub(wb))
	case Prismatic:
		return g.axis.Dot(dv) + wb.Cross(g.axis).Dot(g.d)
	case Distance:
		if l := g.d.Len(); l > 0 {
			return g.d.Dot(dv) / l
		}
	}
	return 0
}

// JointError returns how far a joint is from what it holds now: the
// distance (m) between the points it keeps together (for a distance joint,
// the length outside its range) and the angle (rad) by which the turning it
// forbids is off.
func (w *World) JointError(j JointID) (linear, angular float64) {
	jt := &w.mech.joints[j]
	g := w.jointGeom(jt)
	switch jt.def.Kind {
	case Revolute:
		return g.d.Len(), g.axis.Cross(g.axA).Len()
	case Spherical:
		return g.d.Len(), 0
	case Prismatic:
		return g.d.Sub(g.axis.Mul(g.axis.Dot(g.d))).Len(), g.twist.Len()
	case Fixed:
		return g.d.Len(), g.twist.Len()
	case Distance:
		l := g.d.Len()
		return math.Max(0, math.Max(jt.def.MinLength-l, l-jt.def.MaxLength)), 0
	}
	return 0, 0
}

func (w *World) bodyVel(id BodyID) (shapes.Vec3, shapes.Vec3) {
	if id == Ground {
		return shapes.Vec3{}, shapes.Vec3{}
	}
	return w.b.vel[id], w.b.spin[id]
}

// updatePowered notes whether anything in the world can add energy, so
// that the energy guard knows an energy gain is no blow-up.
func (w *World) updatePowered() {
	m := &w.mech
	m.powered = len(m.motions) > 0 || m.belts > 0
	for i := range m.joints {
		jt := &m.joints[i]
		if jt.def.Motor.Mode != MotorOff || w.b.kind[jt.a] == Kinematic || (jt.b != Ground && w.b.kind[jt.b] == Kinematic) {
			m.powered = true
		}
	}
}

// mechanismDriven reports whether motors, driven bodies or conveyors can
// do work on the bodies this step.
func (w *World) mechanismDriven() bool { return w.mech.powered }
