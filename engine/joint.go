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
	n := BodyID(len(w.b.kind))
	if def.Kind > Distance {
		return -1, w.jointErr(&def, "unknown kind %d", def.Kind)
	}
	if def.A < 0 || def.A >= n {
		return -1, w.jointErr(&def, "body A: no body %d (the world has %d)", def.A, n)
	}
	if def.B != Ground && (def.B < 0 || def.B >= n) {
		return -1, w.jointErr(&def, "body B: no body %d (the world has %d; use Ground for the world)", def.B, n)
	}
	if def.A == def.B {
		return -1, w.jointErr(&def, "joins body %q to itself", w.b.name[def.A])
	}
	if w.b.kind[def.A] != Dynamic && (def.B == Ground || w.b.kind[def.B] != Dynamic) {
		return -1, w.jointErr(&def, "joins %s to %s, and neither is dynamic; a joint needs a body that can move", w.bodyLabel(def.A), w.bodyLabel(def.B))
	}
	if !finiteVec(def.Anchor) || !finiteVec(def.AnchorB) || !finiteVec(def.Axis) {
		return -1, w.jointErr(&def, "anchor and axis must be finite numbers")
	}
	free := def.Kind == Revolute || def.Kind == Prismatic
	if free && !(def.Axis.Len() > 0) {
		return -1, w.jointErr(&def, "a %s joint needs an axis; got zero", def.Kind)
	}
	if def.Limited {
		if !free {
			return -1, w.jointErr(&def, "a %s joint has no angle or travel to limit (use the lengths of a distance joint)", def.Kind)
		}
		if math.IsNaN(def.Lower) || math.IsNaN(def.Upper) || !(def.Lower <= def.Upper) {
			return -1, w.jointErr(&def, "limits must satisfy lower <= upper, got %g and %g", def.Lower, def.Upper)
		}
	}
	if def.Friction != 0 {
		if !free {
			return -1, w.jointErr(&def, "a %s joint has no free motion for friction to resist", def.Kind)
		}
		if !(def.Friction > 0) || math.IsInf(def.Friction, 0) {
			return -1, w.jointErr(&def, "friction must be a finite number >= 0, got %g", def.Friction)
		}
	}
	if err := w.checkMotor(&def, def.Motor); err != nil {
		return -1, err
	}
	pa, qa := w.frame(def.A)
	pb, qb := w.frame(def.B)
	jt := joint{def: def, a: def.A, b: def.B, motorRow: -1}
	anchorB := def.Anchor
	if def.Kind == Distance {
		anchorB = def.AnchorB
		lo, hi := def.MinLength, def.MaxLength
		if !(lo >= 0) || !(hi >= lo) || math.IsInf(hi, 0) {
			return -1, w.jointErr(&def, "lengths must satisfy 0 <= min <= max < infinity, got %g and %g", lo, hi)
		}
		if hi == 0 {
			jt.length = def.AnchorB.Sub(def.Anchor).Len()
			if !(jt.length > 0) {
				return -1, w.jointErr(&def, "the two anchors coincide, so there is no distance to keep; use a spherical joint")
			}
			jt.def.MinLength, jt.def.MaxLength = jt.length, jt.length
		} else if lo == hi {
			jt.length = lo
		}
	}
	jt.ra = qa.Conjugate().Rotate(def.Anchor.Sub(pa))
	jt.rb = qb.Conjugate().Rotate(anchorB.Sub(pb))
	ax := shapes.Vec3{0, 0, 1}
	if free {
		ax = def.Axis.Normalize()
		jt.def.Axis = ax
	}
	ref, _ := perpendiculars(ax)
	jt.axA, jt.axB = qa.Conjugate().Rotate(ax), qb.Conjugate().Rotate(ax)
	jt.refA, jt.refB = qa.Conjugate().Rotate(ref), qb.Conjugate().Rotate(ref)
	jt.rel0 = qb.Conjugate().Mul(qa).Normalize()
	m := &w.mech
	m.joints = append(m.joints, jt)
	for _, id := range [2]BodyID{def.A, def.B} {
		if id != Ground && !slices.Contains(m.jbodies, id) {
			m.jbodies = append(m.jbodies, id)
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

// jgeom is a joint's geometry at the bodies' current poses, world frame.
type jgeom struct {
	rA, rB shapes.Vec3 // lever arms from the bodies' positions to their anchors
	d      shapes.Vec3 // A's anchor minus B's
	axis   shapes.Vec3 // the axis as B carries it
	axA    shapes.Vec3 // the axis as A carries it
	twist  shapes.Vec3 // rotation vector of A away from its pose relative to B at the zero
	raw    float64     // a revolute joint's angle in (-pi, pi]
}

func (w *World) jointGeom(jt *joint) jgeom {
	pa, qa := w.frame(jt.a)
	pb, qb := w.frame(jt.b)
	return jointGeomAt(jt, pa, qa, pb, qb, true)
}

// jointGeomAt is the joint's geometry with the bodies at the given poses;
// a revolute joint's raw angle only if angle is true (the equality rows'
// values do not need it).
func jointGeomAt(jt *joint, pa shapes.Vec3, qa shapes.Quat, pb shapes.Vec3, qb shapes.Quat, angle bool) jgeom {
	var g jgeom
	g.rA, g.rB = rotate(qa, jt.ra), rotate(qb, jt.rb)
	g.d = pa.Add(g.rA).Sub(pb.Add(g.rB))
	g.axis, g.axA = rotate(qb, jt.axB), rotate(qa, jt.axA)
	switch jt.def.Kind {
	case Revolute:
		if !angle {
			break
		}
		ub, ua := rotate(qb, jt.refB), rotate(qa, jt.refA)
		g.raw = math.Atan2(g.axis.Dot(ub.Cross(ua)), ub.Dot(ua))
	case Prismatic, Fixed:
		g.twist = rotationVector(qa.Mul(qb.Mul(jt.rel0).Conjugate()))
	}
	return g
}

// predictAll notes where every jointed body would be at the end of the
// step if it kept moving at constant velocity: at the velocities before the
// solve, with a constant spin, or (solved) at those the solve left in the
// solver's bodies, turned the way the step will turn them (the torque-free
// precession of a body turning off its principal axes is of the same
// second order as the curvature of the joints, and a thin link's is not
// small: leaving it out leaves a thousand times the drift of a spatial
// chain of bars). The velocity targets need no more than the constant
// spin; what they miss the position pass takes.
func (w *World) predictAll(dt float64, solved bool) {
	m := &w.mech
	n := len(w.b.kind)
	m.predP = growFill(m.predP, n, shapes.Vec3{})
	m.predQ = growFill(m.predQ, n, shapes.Quat{})
	if solved && len(m.turn) < n {
		m.turn = append(m.turn, make([]turnMemo, n-len(m.turn))...)
	}
	bodies := w.collision.bodies
	for _, id := range m.jbodies {
		p, q := w.b.pos[id], w.b.rot[id]
		v, s := w.b.vel[id], w.b.spin[id]
		if solved && w.jointFree(id) {
			v, s = bodies[id].V, bodies[id].W
		}
		switch {
		case solved && w.jointFree(id):
			// As the step will integrate it, precession included; the
			// integration reuses it (turnMemo).
			qp, sp := freeRotation(qmul(&q, &w.b.axes[id]), w.b.moments[id], s, dt)
			m.turn[id] = turnMemo{step: w.steps, q: q, spin: s, dt: dt, qp: qp, sp: sp}
			p, q = p.Add(v.Mul(dt)), qmulConj(&qp, &w.b.axes[id]).Normalize()
		case w.b.kind[id] != Static:
			p, q = p.Add(v.Mul(dt)), integrateQuat(q, s, dt)
		}
		m.predP[id], m.predQ[id] = p, q
	}
}

// turnMemo is a free rotation worked out by predictAll for the step
// numbered step: freeRotation of the body's orientation q (times its
// principal axes) at spin over dt gave qp and the new spin sp.
type turnMemo struct {
	step     int
	q        shapes.Quat
	spin, sp shapes.Vec3
	dt       float64
	qp       shapes.Quat
}

// freeTurn is freeRotation of a dynamic body over the step, taken from
// predictAll's memo when it was worked out for the same step and state.
func (w *World) freeTurn(id BodyID, dt float64) (shapes.Quat, shapes.Vec3) {
	if t := w.mech.turn; int(id) < len(t) {
		if m := &t[id]; m.step == w.steps && m.dt == dt && m.q == w.b.rot[id] && m.spin == w.b.spin[id] {
			return m.qp, m.sp
		}
	}
	return freeRotation(qmul(&w.b.rot[id], &w.b.axes[id]), w.b.moments[id], w.b.spin[id], dt)
}

// predicted returns a jointed body's pose from the last predictAll.
func (w *World) predicted(id BodyID) (shapes.Vec3, shapes.Quat) {
	if id == Ground {
		return shapes.Vec3{}, mgl64.QuatIdent()
	}
	return w.mech.predP[id], w.mech.predQ[id]
}

// rowSpeed is a row's Cdot with the solver bodies' velocities.
func rowSpeed(r *contact.Row, bodies []contact.Body) float64 {
	A, B := &bodies[r.A], &bodies[r.B]
	return r.LinA.Dot(A.V) + r.AngA.Dot(A.W) + r.LinB.Dot(B.V) + r.AngB.Dot(B.W)
}

// rotate turns v by unit quaternion q: v + w t + u x t with t = 2 u x v
// (u the vector part), without forming quaternion products.
func rotate(q shapes.Quat, v shapes.Vec3) shapes.Vec3 {
	u := q.V
	t := shapes.Vec3{2 * (u[1]*v[2] - u[2]*v[1]), 2 * (u[2]*v[0] - u[0]*v[2]), 2 * (u[0]*v[1] - u[1]*v[0])}
	return shapes.Vec3{
		v[0] + q.W*t[0] + u[1]*t[2] - u[2]*t[1],
		v[1] + q.W*t[1] + u[2]*t[0] - u[0]*t[2],
		v[2] + q.W*t[2] + u[0]*t[1] - u[1]*t[0],
	}
}

// rotationVector returns the axis times the angle (rad, at most pi) of a
// unit quaternion.
func rotationVector(q shapes.Quat) shapes.Vec3 {
	if q.W < 0 {
		q = q.Scale(-1)
	}
	s := q.V.Len()
	if s < 1e-12 {
		return q.V.Mul(2) // small angle: 2 sin(a/2) axis = a axis to rounding
	}
	return q.V.Mul(2 * math.Atan2(s, q.W) / s)
}

// wrapAngle maps an angle difference into [-pi, pi).
func wrapAngle(a float64) float64 {
	return a - 2*math.Pi*math.Floor((a+math.Pi)/(2*math.Pi))
}

// perpendiculars returns two unit vectors normal to unit n and to each
// other, without a branch on a near-zero component: Duff, Burgess,
// Christensen, Hery, Kensler, Liani and Villemin, "Building an orthonormal
// basis, revisited", JCGT 6(1), 2017.
func perpendiculars(n shapes.Vec3) (shapes.Vec3, shapes.Vec3) {
	sign := math.Copysign(1, n[2])
	a := -1 / (sign + n[2])
	b := n[0] * n[1] * a
	return shapes.Vec3{1 + sign*n[0]*n[0]*a, sign * b, -sign * n[0]}, shapes.Vec3{b, sign + n[1]*n[1]*a, -n[1]}
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

// wakeJointed wakes the bodies jointed to a body that has just woken.
func (w *World) wakeJointed(id BodyID) {
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		switch {
		case jt.a == id && jt.b != Ground:
			w.wake(jt.b)
		case jt.b == id:
			w.wake(jt.a)
		}
	}
}

// unionJoints puts jointed dynamic bodies into one island.
func (w *World) unionJoints() {
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		if jt.b != Ground && w.b.kind[jt.a] == Dynamic && w.b.kind[jt.b] == Dynamic {
			w.union(int32(jt.a), int32(jt.b))
		}
	}
}

// jointsKeepAwake keeps awake the islands jointed to a moving kinematic
// body or driven by a running motor.
func (w *World) jointsKeepAwake() {
	c := &w.collision
	moving := func(id BodyID) bool {
		return id != Ground && w.b.kind[id] == Kinematic && (w.b.vel[id] != (shapes.Vec3{}) || w.b.spin[id] != (shapes.Vec3{}))
	}
	for i := range w.mech.joints {
		jt := &w.mech.joints[i]
		if m := jt.def.Motor; m.Mode == MotorSpeed && m.Speed != 0 {
			// A running motor keeps its bodies awake, stalled or not.
			for _, id := range [2]BodyID{jt.a, jt.b} {
				if id != Ground && w.b.kind[id] == Dynamic {
					c.islandRest[w.find(int32(id))] = 0
				}
			}
		}
		if moving(jt.b) && w.b.kind[jt.a] == Dynamic {
			c.islandRest[w.find(int32(jt.a))] = 0
		}
		if moving(jt.a) && jt.b != Ground && w.b.kind[jt.b] == Dynamic {
			c.islandRest[w.find(int32(jt.b))] = 0
		}
	}
}

// jointRows appends the rows of every joint with a body free to move this
// step. It runs inside the solve, once the solver's bodies are filled; the
// ground is an extra body with zero inverse mass after the world's bodies.
func (w *World) jointRows(dt float64, rows []contact.Row) []contact.Row {
	m := &w.mech
	if len(m.joints) == 0 {
		return rows
	}
	c := &w.collision
	n := len(w.b.kind)
	c.bodies = append(c.bodies[:n], contact.Body{})
	m.dt = dt
	w.predictAll(dt, false)
	w.groupJoints()
	// The position pass removes Settings.Correction of each row's predicted
	// error per step; scaling the drift gives joints their own fraction.
	scale := w.jointScale()
	// The rows for the sweeps first, then those the exact solve does alone
	// (jointtree.go); the solver is given the first part.
	m.rows = m.rows[:0]
	swept := 0
	for pass := 0; pass < 2; pass++ {
		for j := range m.joints {
			jt := &m.joints[j]
			free := w.jointFree(jt.a) || w.jointFree(jt.b)
			if pass == 0 {
				jt.first, jt.count, jt.motorRow = 0, 0, -1
				jt.eqFirst, jt.eqCount = 0, 0
			}
			if !free || w.swept(jt) != (pass == 0) {
				continue
			}
			jt.first = int32(len(m.rows))
			m.rows = w.appendJointRows(jt, uint64(j)<<8, dt, scale, pass == 0, m.rows)
			jt.count = int32(len(m.rows)) - jt.first
		}
		if pass == 0 {
			swept = len(m.rows)
		}
	}
	return m.rows[:swept]
}

// jointFree reports whether a joint body moves under forces this step.
func (w *World) jointFree(id BodyID) bool {
	return id != Ground && w.b.kind[id] == Dynamic && w.b.awake[id]
}

// Row key offsets within a joint's block of 256 keys.
const (
	keyLower = 1 + iota
	keyUpper
	keyMotor
	keyFriction
	keyEq = 8 // up to 6 rows
)

// appendJointRows appends a joint's rows; swept says whether they go to the
// sweeps (decoupled for them) or only to the exact solve (scaled to unit
// coupling, which is all it needs).
func (w *World) appendJointRows(jt *joint, key uint64, dt, scale float64, swept bool, rows []contact.Row) []contact.Row {
	c := &w.collision
	ia, ib := int32(jt.a), int32(jt.b)
	if jt.b == Ground {
		ib = int32(len(w.b.kind))
	}
	g := w.jointGeom(jt)
	jt.lever = g.rA
	inf := math.Inf(1)
	def := &jt.def

	// The joint's free coordinate, and its row (Jacobian of its rate).
	var q float64
	var axisRow contact.Row
	axisRow.A, axisRow.B = ia, ib
	switch def.Kind {
	case Revolute:
		jt.angle += wrapAngle(g.raw - jt.raw)
		jt.raw = g.raw
		q = jt.angle
		axisRow.AngA, axisRow.AngB = g.axis, g.axis.Mul(-1)
	case Prismatic:
		q = g.axis.Dot(g.d)
		axisRow.LinA, axisRow.AngA = g.axis, g.rA.Cross(g.axis)
		axisRow.LinB, axisRow.AngB = g.axis.Mul(-1), g.rB.Add(g.d).Cross(g.axis).Mul(-1)
	}

	// One-sided and bounded rows first; the equality block last, so each
	// sweep ends with the joint itself solved.
	if def.Limited {
		// Speculative limits: a row may let the joint close its gap to the
		// limit within the step (target -gap/dt) but not pass it; a joint
		// already past is stopped and pushed back by the position pass.
		for side, gap := range [2]float64{q - def.Lower, def.Upper - q} {
			r := axisRow
			if side == 1 {
				r = negRow(r)
			}
			r.Target = -max(gap, 0) / dt
			r.Lo, r.Hi = 0, inf
			r.Correct, r.Drift = true, gap*scale
			r.Key = key | uint64(keyLower+side)
			rows = append(rows, r)
		}
	}
	switch def.Motor.Mode {
	case MotorSpeed:
		r := axisRow
		r.Target = def.Motor.Speed
		cap := def.Motor.MaxForce * dt
		r.Lo, r.Hi = -cap, cap
		r.Key = key | keyMotor
		jt.motorRow = int32(len(rows)) - jt.first
		rows = append(rows, r)
	case MotorServo:
		// Filled in below, once the equality block gives the effective mass.
		jt.motorRow = int32(len(rows)) - jt.first
		rows = append(rows, axisRow)
	}
	if def.Friction > 0 {
		r := axisRow
		f := def.Friction * dt
		r.Lo, r.Hi = -f, f
		r.Key = key | keyFriction
		rows = append(rows, r)
	}

	// The equality rows. Each holds a value C (a component of the anchors'
	// offset, of the misalignment of the axes, ...) at zero. Its Jacobian is
	// C's rate now, but C is curved: moving with the velocity v for the step
	// changes it by J v dt plus a remainder rho of second order (the
	// centripetal term of a swinging link). The velocity target -rho/dt asks
	// for the velocity that ends the step on the constraint; a target of 0
	// would leave the link a little off it at the end of every step, and
	// projecting that off next step would take (omega dt)^2 of the kinetic
	// energy per step (3 percent per swing of a 1 m pendulum at 1 ms). The
	// remainder is taken from the velocities before the solve, predicting
	// the poses the way the step integrates them. The position pass then
	// removes C itself.
	eq := len(rows)
	_, qb := w.frame(jt.b)
	bs := &jt.basis
	bs.p1, bs.p2 = perpendiculars(g.axis)
	if def.Kind == Prismatic { // its off-axis rows turn with B (eqValues)
		bs.p1B, bs.p2B = rotate(qb.Conjugate(), bs.p1), rotate(qb.Conjugate(), bs.p2)
	}
	var cNow, cEnd [6]float64
	n := eqValues(jt, &g, qb, bs, &cNow)
	pa1, qa1 := w.predicted(jt.a)
	pb1, qb1 := w.predicted(jt.b)
	ge := jointGeomAt(jt, pa1, qa1, pb1, qb1, false)
	eqValues(jt, &ge, qb1, bs, &cEnd)
	add := func(linA, angA, linB, angB shapes.Vec3) {
		k := len(rows) - eq
		rows = append(rows, eqRow(ia, ib, linA, angA, linB, angB, cNow[k], key|uint64(keyEq+k)))
	}
	point := func(lb shapes.Vec3) { // A's anchor held to B's; lb is B's lever arm
		for k := 0; k < 3; k++ {
			var e shapes.Vec3
			e[k] = 1
			add(e, g.rA.Cross(e), e.Mul(-1), lb.Cross(e).Mul(-1))
		}
	}
	lock := func() { // no turning of A relative to B
		for k := 0; k < 3; k++ {
			var e shapes.Vec3
			e[k] = 1
			add(shapes.Vec3{}, e, shapes.Vec3{}, e.Mul(-1))
		}
	}
	oneSided := false
	switch def.Kind {
	case Revolute:
		point(g.rB)
		// A's axis kept along B's: p . (axis_B x axis_A) = 0 for the two
		// normals p; its rate is p . (w_A - w_B) at the joint.
		for _, p := range [2]shapes.Vec3{bs.p1, bs.p2} {
			add(shapes.Vec3{}, p, shapes.Vec3{}, p.Mul(-1))
		}
	case Spherical:
		point(g.rB)
	case Fixed:
		point(g.rB)
		lock()
	case Prismatic:
		lock()
		// Off-axis travel p . d = 0, with p turning with B.
		lb := g.rB.Add(g.d)
		for _, p := range [2]shapes.Vec3{bs.p1, bs.p2} {
			add(p, g.rA.Cross(p), p.Mul(-1), lb.Cross(p).Mul(-1))
		}
	case Distance:
		if n == 0 {
			break // anchors together: the direction is undefined for this step
		}
		nr := g.d.Normalize()
		linA, angA, linB, angB := nr, g.rA.Cross(nr), nr.Mul(-1), g.rB.Cross(nr).Mul(-1)
		add(linA, angA, linB, angB)
		if n == 2 { // a rope or a stop: one-sided rows at either end of the range
			add(linA.Mul(-1), angA.Mul(-1), linB.Mul(-1), angB.Mul(-1))
			oneSided = true
		}
	}
	for i := eq; i < len(rows); i++ {
		r := &rows[i]
		gap := r.Drift
		rho := cEnd[i-eq] - gap - rowSpeed(r, c.bodies)*dt
		r.Target = -rho / dt
		r.Drift = gap*scale + rho
		if oneSided {
			// Speculative, like a limit: it may close the gap within the
			// step but not pass it.
			r.Target = -(max(gap, 0) + rho) / dt
			r.Lo, r.Hi = 0, inf
			r.Key = key | uint64(keyLower+i-eq)
		}
	}
	if oneSided {
		eq = len(rows) // not part of the block
	}
	jt.eqFirst, jt.eqCount = int32(eq), int32(len(rows)-eq)
	decoupled := false
	if swept {
		decoupled = decouple(rows[eq:], c.bodies, &jt.chol)
	} else {
		normalise(rows[eq:], c.bodies, &jt.chol)
	}
	if def.Motor.Mode == MotorServo {
		rows[int(jt.first)+int(jt.motorRow)] = w.servoRow(jt, axisRow, q, dt, rows[eq:], decoupled, key|keyMotor)
	}
	return rows
}

func eqRow(a, b int32, linA, angA, linB, angB shapes.Vec3, drift float64, key uint64) contact.Row {
	inf := math.Inf(1)
	return contact.Row{A: a, B: b, LinA: linA, AngA: angA, LinB: linB, AngB: angB,
		Lo: -inf, Hi: inf, Correct: true, Drift: drift, Key: key}
}

func negRow(r contact.Row) contact.Row {
	r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(-1), r.AngA.Mul(-1), r.LinB.Mul(-1), r.AngB.Mul(-1)
	return r
}

// minvJ is M^-1 J^T of a row: the velocity changes per unit impulse.
type minvJ struct{ va, wa, vb, wb shapes.Vec3 }

func responseOf(r *contact.Row, bodies []contact.Body) minvJ {
	A, B := &bodies[r.A], &bodies[r.B]
	return minvJ{r.LinA.Mul(A.InvMass), A.InvInertia.Mul3x1(r.AngA), r.LinB.Mul(B.InvMass), B.InvInertia.Mul3x1(r.AngB)}
}

// coupling is J_r M^-1 J_s^T for rows r and s of the same two bodies.
func coupling(r *contact.Row, s minvJ) float64 {
	return r.LinA.Dot(s.va) + r.AngA.Dot(s.wa) + r.LinB.Dot(s.vb) + r.AngB.Dot(s.wb)
}

// selfCoupling is J M^-1 J^T of one row: coupling(r, responseOf(r,
// bodies)) with the same arithmetic, without the temporaries.
func selfCoupling(r *contact.Row, bodies []contact.Body) float64 {
	A, B := &bodies[r.A], &bodies[r.B]
	return linCoupling(&r.LinA, A.InvMass) + angCoupling(&r.AngA, &A.InvInertia) +
		linCoupling(&r.LinB, B.InvMass) + angCoupling(&r.AngB, &B.InvInertia)
}

func linCoupling(v *shapes.Vec3, invMass float64) float64 {
	return v[0]*(v[0]*invMass) + v[1]*(v[1]*invMass) + v[2]*(v[2]*invMass)
}

func angCoupling(v *shapes.Vec3, inv *shapes.Mat3) float64 {
	u0 := inv[0]*v[0] + inv[3]*v[1] + inv[6]*v[2]
	u1 := inv[1]*v[0] + inv[4]*v[1] + inv[7]*v[2]
	u2 := inv[2]*v[0] + inv[5]*v[1] + inv[8]*v[2]
	return v[0]*u0 + v[1]*u1 + v[2]*u2
}

// decoupleTol is the smallest pivot of the Cholesky factor, relative to its
// row's own diagonal entry, at which a joint's rows still count as
// independent; below it (a body with no mass in some direction) the rows
// are left as they are.
const decoupleTol = 1e-9

// decouple replaces a joint's equality rows J (at most 6) by L^-1 J, where
// L L^T = J M^-1 J^T is the Cholesky factor of the rows' coupling matrix:
// the new rows span the same constraints, and their coupling matrix is the
// identity, so one Gauss-Seidel sweep over them solves the joint exactly
// (block Gauss-Seidel across joints, at the cost of scalar sweeps). Without
// it the sweeps over a hinge's rows converge slowly for a body whose lever
// arm is long against its radius of gyration. The drifts and targets are
// transformed alike. It reports whether the rows were transformed.
func decouple(rows []contact.Row, bodies []contact.Body, chol *cholesky) bool {
	n := len(rows)
	if n < 1 || n > 6 {
		return false
	}
	var resp [6]minvJ
	for i := 0; i < n; i++ {
		resp[i] = responseOf(&rows[i], bodies)
	}
	chol.n = 0
	L := &chol.l
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			s := coupling(&rows[i], resp[j])
			diag := s
			for k := 0; k < j; k++ {
				s -= L[i][k] * L[j][k]
			}
			if i == j {
				if !(s > decoupleTol*diag) {
					return false
				}
				L[i][i] = math.Sqrt(s)
			} else {
				L[i][j] = s / L[j][j]
			}
		}
	}
	for i := 0; i < n; i++ {
		r := &rows[i]
		for k := 0; k < i; k++ {
			f := L[i][k]
			p := &rows[k]
			r.LinA, r.AngA = r.LinA.Sub(p.LinA.Mul(f)), r.AngA.Sub(p.AngA.Mul(f))
			r.LinB, r.AngB = r.LinB.Sub(p.LinB.Mul(f)), r.AngB.Sub(p.AngB.Mul(f))
			r.Drift -= p.Drift * f
			r.Target -= p.Target * f
		}
		s := 1 / L[i][i]
		r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(s), r.AngA.Mul(s), r.LinB.Mul(s), r.AngB.Mul(s)
		r.Drift *= s
		r.Target *= s
	}
	chol.n = n
	return true
}

// normalise scales a joint's equality rows to unit coupling each (the
// diagonal of J M^-1 J^T), recording the scales as a diagonal factor.
func normalise(rows []contact.Row, bodies []contact.Body, chol *cholesky) {
	chol.n = 0
	if len(rows) > 6 {
		return
	}
	for i := range rows {
		r := &rows[i]
		k := selfCoupling(r, bodies)
		if !(k > 0) || math.IsInf(k, 0) {
			chol.n = 0
			return // left as it is; the exact solve then fails and skips
		}
		s := math.Sqrt(k)
		for j := range chol.l[i] {
			chol.l[i][j] = 0
		}
		chol.l[i][i] = s
		r.LinA, r.AngA, r.LinB, r.AngB = r.LinA.Mul(1/s), r.AngA.Mul(1/s), r.LinB.Mul(1/s), r.AngB.Mul(1/s)
		r.Drift /= s
		r.Target /= s
		chol.n = i + 1
	}
}

// cholesky is the factor L of a joint's decoupled rows (n = 0: none).
type cholesky struct {
	n int
	l [6][6]float64
}

// apply writes L^-1 c into c: values in the decoupled rows' basis.
func (ch *cholesky) apply(c *[6]float64) {
	for i := 0; i < ch.n; i++ {
		v := c[i]
		for k := 0; k < i; k++ {
			v -= ch.l[i][k] * c[k]
		}
		c[i] = v / ch.l[i][i]
	}
}

// eqBasis holds the directions that a joint's equality rows measure along
// this step: normals of the axis in the world, and in B's frame for rows
// that turn with B.
type eqBasis struct{ p1, p2, p1B, p2B shapes.Vec3 }

// eqValues writes the values C of a joint's equality rows, in the order of
// its rows, with the bodies at the poses of geometry g (B turned by qb),
// and returns how many rows there are.
func eqValues(jt *joint, g *jgeom, qb shapes.Quat, bs *eqBasis, out *[6]float64) int {
	switch jt.def.Kind {
	case Revolute:
		cr := g.axis.Cross(g.axA)
		out[0], out[1], out[2], out[3], out[4] = g.d[0], g.d[1], g.d[2], bs.p1.Dot(cr), bs.p2.Dot(cr)
		return 5
	case Spherical:
		out[0], out[1], out[2] = g.d[0], g.d[1], g.d[2]
		return 3
	case Fixed:
		out[0], out[1], out[2], out[3], out[4], out[5] = g.d[0], g.d[1], g.d[2], g.twist[0], g.twist[1], g.twist[2]
		return 6
	case Prismatic:
		out[0], out[1], out[2] = g.twist[0], g.twist[1], g.twist[2]
		out[3], out[4] = rotate(qb, bs.p1B).Dot(g.d), rotate(qb, bs.p2B).Dot(g.d)
		return 5
	case Distance:
		l := g.d.Len()
		if !(l > 1e-12) {
			return 0
		}
		if jt.def.MinLength == jt.def.MaxLength {
			out[0] = l - jt.length
			return 1
		}
		out[0], out[1] = l-jt.def.MinLength, jt.def.MaxLength-l
		return 2
	}
	return 0
}

// servoRow returns the row of a servo: a spring-damper toward the target,
// integrated implicitly over the step (backward Euler, so that a stiff
// servo stays stable): with effective mass m along the joint's free
// coordinate q, speed v0 at the start of the step and v1 = v0 + lambda/m
// at its end, the impulse is
//
//	lambda = h (k (q* - q - h v1) - c v1),
//
// solved for lambda and capped at MaxForce h. It is applied as a fixed
// impulse (Lo = Hi = lambda). The effective mass is that of the free
// coordinate with the joint's other rows holding (a Schur complement; the
// decoupled rows make it 1/(k_aa - sum_i (J'_i M^-1 J_a^T)^2)), so a hinged
// arm responds with its inertia about the pivot.
func (w *World) servoRow(jt *joint, r contact.Row, q, h float64, eq []contact.Row, decoupled bool, key uint64) contact.Row {
	bodies := w.collision.bodies
	resp := responseOf(&r, bodies)
	kinv := coupling(&r, resp)
	if decoupled {
		for i := range eq {
			y := coupling(&eq[i], resp)
			kinv -= y * y
		}
	}
	m := &jt.def.Motor
	lambda := 0.0
	if kinv > 0 {
		A, B := &bodies[r.A], &bodies[r.B]
		v0 := r.LinA.Dot(A.V) + r.AngA.Dot(A.W) + r.LinB.Dot(B.V) + r.AngB.Dot(B.W)
		kc := h * (h*m.Stiffness + m.Damping)
		lambda = (h*m.Stiffness*(m.Target-q) - kc*v0) / (1 + kc*kinv)
		lim := m.MaxForce * h
		lambda = min(max(lambda, -lim), lim)
	}
	r.Lo, r.Hi, r.Key = lambda, lambda, key
	return r
}

// jointScale is the factor on a row's drift that makes the position pass
// remove jointCorrection of it per step (see jointRows).
func (w *World) jointScale() float64 {
	if corr := w.collision.solver.Settings.Correction; corr > 0 {
		return jointCorrection / corr
	}
	return 1
}

// afterJointSolve runs after the contact solve: the exact projection of
// the velocities and pseudo-velocities onto the joints that form a forest
// (jointtree.go). The joints' reactions are read from the rows when asked
// (JointReaction).
func (w *World) afterJointSolve(dt float64) {
	if len(w.mech.joints) == 0 {
		return
	}
	if w.buildTree() {
		w.projectJoints(false)
		if w.collision.solver.Settings.PositionIterations > 0 {
			w.predictAll(dt, true)
			w.projectJoints(true)
		}
	}
}
