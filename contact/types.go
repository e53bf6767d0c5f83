package contact

import "clatter/shapes"

// Body is the solver's view of one rigid body. The engine keeps a slice of
// them, indexed by the same integer ids that Point and Row use.
//
// Static and kinematic bodies have InvMass 0 and a zero InvInertia; their V
// and W (a driver's velocity) are read but never changed.
type Body struct {
	InvMass    float64     // 1/mass, 0 for static and kinematic bodies
	InvInertia shapes.Mat3 // inverse inertia about the centre of mass, world frame
	Position   shapes.Vec3 // world centre of mass (lever arms of contact points)
	V, W       shapes.Vec3 // linear and angular velocity, read and written by Solve

	// Vp and Wp are pseudo-velocities written by the position pass of Solve
	// (split impulses). The engine integrates positions with V+Vp and W+Wp and
	// then discards them; they never enter V and W, so position correction adds
	// no kinetic energy. Solve overwrites them every step.
	Vp, Wp shapes.Vec3

	// DV and DW are the part of V and W that this step's forces (gravity,
	// applied forces) added before Solve. The impact phase measures approach
	// speeds on V-DV, W-DW, the motion the bodies arrived with, so that no
	// bounce returns the step's gravity as extra speed and a contact that
	// gravity alone presses is never taken for an impact. Zero means that V
	// and W hold no such part. Solve does not change them.
	DV, DW shapes.Vec3

	// Size (m) is the body's radius about its centre of mass, or 0 if not
	// given; it bounds the velocity error that the sweeps may leave at its
	// contacts (turn.go).
	Size float64
}

// Point is one contact point between bodies A and B, filled by the engine
// after the narrow phase. The fields after Key are outputs written by Solve.
//
// The points of one contact manifold (one body pair) should be consecutive:
// the impact phase treats a run of consecutive points of the same pair as one
// unit, which is what lets a flat face land without spurious spin.
type Point struct {
	A, B       int32       // body indices; A != B
	Position   shapes.Vec3 // world contact point
	Normal     shapes.Vec3 // unit, from A toward B
	Separation float64     // signed gap along Normal: < 0 penetrating, > 0 speculative (not yet touching)

	// Mixed pair coefficients. StaticFriction below Friction (for instance
	// left at 0) means "same as Friction". Restitution below 0 counts as 0.
	Friction, StaticFriction, Restitution float64

	// SurfaceVelocity is the velocity of B's surface relative to A's that
	// friction drives the contact toward (a conveyor belt); only its part in
	// the tangent plane is used. Zero for ordinary contacts.
	SurfaceVelocity shapes.Vec3

	// PatchCenter and PatchRadius describe the contact patch that the points
	// of a face or edge contact sample: its centre on the contact plane and
	// its effective friction radius (m), the mean distance from the centre
	// over the patch under uniform pressure (a disc of radius R: 2R/3; a
	// segment of length L: L/4). Consecutive points of one pair with equal
	// PatchCenter and PatchRadius > 0 form one patch, whose friction resists
	// sliding and twisting together (twist.go). PatchRadius 0 (a point
	// contact) leaves friction at the points.
	PatchCenter shapes.Vec3
	PatchRadius float64

	// Key identifies the touching features of the two bodies; it must stay
	// the same while the same features touch and be unique within a step.
	// Impulses carry over between steps by Key (warm starting).
	Key uint64

	// NormalImpulse is the accumulated normal impulse of the velocity solve
	// (N s, on B along Normal, >= 0). This is the warm-started part.
	NormalImpulse float64
	// FrictionImpulse is the friction impulse of the velocity solve on B,
	// world frame, in the tangent plane, |FrictionImpulse| <= mu NormalImpulse.
	FrictionImpulse shapes.Vec3
	// ImpactImpulse and ImpactFriction are the normal and friction impulses
	// of the impact (restitution) phase, summed over its passes. The total
	// impulse on B is (NormalImpulse+ImpactImpulse) Normal + FrictionImpulse + ImpactFriction.
	ImpactImpulse  float64
	ImpactFriction shapes.Vec3
	// StopImpulse is the normal impulse (N s, on B along Normal) with which
	// the velocity solves of earlier steps stopped this point at its gap
	// while its impact was deferred (held.go), reported with the impact
	// when it arrives this step; 0 otherwise. It acted in those steps and
	// is counted in no other field: ImpactImpulse plus StopImpulse is the
	// whole impact's impulse.
	StopImpulse float64
	// ImpactSpeed is the largest approach speed (m/s) at which the impact
	// phase processed this point in this step, 0 if it was no impact.
	ImpactSpeed float64
	// Sliding reports that the kinetic coefficient was used this step (the
	// contact slips); false means it stuck and used the static coefficient.
	Sliding bool
}

// Row is one extra scalar constraint between two bodies, added by the engine
// each step (joints, limits, motors). It takes part in the same velocity
// iterations as the contact rows: the solver drives the row's velocity
//
//	Cdot = LinA·V_A + AngA·W_A + LinB·V_B + AngB·W_B
//
// toward Target with an accumulated impulse clamped to [Lo, Hi]; the impulse
// acts on the bodies as J^T Impulse. A row to the world uses a static body.
type Row struct {
	A, B                   int32
	LinA, AngA, LinB, AngB shapes.Vec3 // Jacobian
	Target                 float64     // velocity the row drives Cdot to (0 for a rigid joint, a speed for a motor)
	Lo, Hi                 float64     // impulse bounds (N s for linear rows); use -Inf, +Inf for an equality

	// Correct makes the row take part in the position pass, which removes
	// Drift (the position error C along the row, Cdot = dC/dt) with
	// pseudo-velocities. Bounds there are the signs of Lo and Hi: a row with
	// Lo >= 0 may only push, one with Hi <= 0 may only pull.
	Correct bool
	Drift   float64

	// Key carries the impulse over between steps (warm starting); keys of
	// rows are separate from keys of points and must be unique within a step.
	Key uint64

	// Impulse is the output: the accumulated impulse of the velocity solve.
	Impulse float64
}

// Report sums up one Solve, for impact events and diagnostics.
type Report struct {
	Impacts        int     // points that received a restitution impulse
	ImpactPasses   int     // passes of the impact phase that found an impact
	MaxImpactSpeed float64 // largest approach speed processed by the impact phase, m/s
	NormalImpulse  float64 // sum over points of NormalImpulse + ImpactImpulse, N s
	Iterations     int     // velocity iterations run (fewer than the setting if Tolerance was met)
	Residual       float64 // largest velocity change (m/s) any row made in the last velocity iteration
}
