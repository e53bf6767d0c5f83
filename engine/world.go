package engine

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"clatter/shapes"
)

// StandardGravity is 9.80665 m/s^2 (CGPM 1901).
const StandardGravity = 9.80665

// Config holds a world's settings. The zero value of a field means its default.
type Config struct {
	// Gravity, m/s^2, used as given (DefaultConfig sets standard gravity along -z).
	Gravity shapes.Vec3
	// SubSteps splits each Step into this many equal steps (default 1).
	SubSteps int
	// VelocityIterations is the most velocity iterations of the contact
	// solver per step (default 30); it stops earlier once the impulses have
	// converged (contact.Settings.Convergence). PositionIterations are those
	// of the position pass (default 3).
	VelocityIterations, PositionIterations int
	// Slop is the penetration, m, left alone by position correction and the
	// extra margin of speculative contacts (default 0.2 mm).
	Slop float64
	// BounceThreshold, m/s: slower impacts get no restitution. The default 0
	// ties it, for rigid contacts, to the step (1.5 steps of gravity, and
	// of a turning contact's own acceleration), and keeps 0.1 m/s for
	// compliant ones (bounce.go).
	BounceThreshold float64
	// RestSpeed (m/s), RestSpin (rad/s) and RestTime (s): a body slower than
	// both for RestTime is at rest; an island at rest sleeps (defaults
	// DefaultRestSpeed, DefaultRestSpin, DefaultRestTime in defaults.go).
	RestSpeed, RestSpin, RestTime float64
	// NoSleep keeps every body awake (rest is still tracked for Settled).
	NoSleep bool
	// NoEvents turns off event collection, for headless trials.
	NoEvents bool
	// NoDivergenceCheck turns off the energy-jump guard (NaN is always checked).
	NoDivergenceCheck bool
}

func (c *Config) fill() error {
	if !finiteVec(c.Gravity) {
		return errors.New("gravity must be finite")
	}
	def := func(v *float64, d float64, name string) error {
		if *v == 0 {
			*v = d
		}
		if !(*v > 0) || math.IsInf(*v, 0) {
			return fmt.Errorf("%s must be a positive number, got %g", name, *v)
		}
		return nil
	}
	defInt := func(v *int, d int, name string) error {
		if *v == 0 {
			*v = d
		}
		if *v < 1 || *v > 10000 {
			return fmt.Errorf("%s must be between 1 and 10000, got %d", name, *v)
		}
		return nil
	}
	if !(c.BounceThreshold >= 0) || math.IsInf(c.BounceThreshold, 0) {
		return fmt.Errorf("bounce threshold must be 0 (tied to the step) or a positive speed, got %g", c.BounceThreshold)
	}
	for _, e := range []error{
		defInt(&c.SubSteps, 1, "sub-steps"),
		defInt(&c.VelocityIterations, 30, "velocity iterations"),
		defInt(&c.PositionIterations, 3, "position iterations"),
		def(&c.Slop, DefaultSlop, "slop"),
		def(&c.RestSpeed, DefaultRestSpeed, "rest speed"),
		def(&c.RestSpin, DefaultRestSpin, "rest spin"),
		def(&c.RestTime, DefaultRestTime, "rest time"),
	} {
		if e != nil {
			return e
		}
	}
	return nil
}

// DefaultConfig is the zero Config with standard gravity along -z.
func DefaultConfig() Config { return Config{Gravity: shapes.Vec3{0, 0, -StandardGravity}} }

// World is a set of bodies and the state of their simulation. It is not
// safe for concurrent use; run one world per goroutine.
type World struct {
	cfg          Config
	materials    []Material
	pairOverride map[[2]int]PairCoefficients
	pairs        []PairCoefficients
	b            bodyData
	kicks        []kick
	motorChanges []motorChange // schedule.go
	events       []Event
	time         float64
	timeLost     float64 // the low-order part of time (clock.go)
	steps        int
	settledAt    float64
	settled      bool
	err          error
	preSolve     preSolveLog   // energies before the last steps' contact solves (energy.go)
	flight       []shapes.Vec3 // velocities after gravity, before the solve (flight.go)
	pushed       []bool        // bodies a contact, joint or force acted on this step (flight.go)
	ledger       energyLedger  // the energy guard over many steps (ledger.go)

	collision collisionState
	active    activeSet   // the awake bodies (active.go)
	mech      mechanisms  // joints and drivers (joint.go, driver.go)
	gates     gateState   // counting gates (gate.go)
	soft      softState   // compliant contacts (compliant.go)
	nap       napState    // islands asleep before their rest time ran out (nap.go)
	steady    steadyState // the velocities each body's rest began with (steady.go)
	kept      keptState   // meshes and principal axes, kept by Reset (reuse.go)
}

// kick is an impulse applied at a moment.
type kick struct {
	body    BodyID
	time    float64
	impulse shapes.Vec3
	at      shapes.Vec3
	hasAt   bool
}

// NewWorld returns an empty world with the default material at index 0.
func NewWorld(cfg Config) (*World, error) {
	w := &World{}
	if err := w.Reset(cfg); err != nil { // reuse.go
		return nil, err
	}
	return w, nil
}

// Config returns the world's settings with defaults filled in.
func (w *World) Config() Config { return w.cfg }

// Time is the simulated time, s.
func (w *World) Time() float64 { return w.time }

// Steps is the number of steps taken (sub-steps count one each).
func (w *World) Steps() int { return w.steps }

// Settled reports whether every dynamic body has come to rest with nothing
// scheduled still to move it (see the Settled event), and when.
func (w *World) Settled() (bool, float64) { return w.settled, w.settledAt }

// Kick schedules an impulse (N s, world frame) on a body at time t, applied
// at the world point at (at the centre of mass if atCenter is true).
func (w *World) Kick(id BodyID, t float64, impulse, at shapes.Vec3, atCenter bool) error {
	if id < 0 || int(id) >= len(w.b.kind) {
		return fmt.Errorf("kick: no body %d", id)
	}
	if w.b.kind[id] != Dynamic {
		return fmt.Errorf("kick: body %q is %s; only dynamic bodies can be kicked", w.b.name[id], w.b.kind[id])
	}
	if !finiteVec(impulse) || !finiteVec(at) || math.IsNaN(t) || math.IsInf(t, 0) {
		return fmt.Errorf("kick on %q: time, impulse and point must be finite", w.b.name[id])
	}
	w.kicks = append(w.kicks, kick{body: id, time: t, impulse: impulse, at: at, hasAt: !atCenter})
	sort.SliceStable(w.kicks, func(i, j int) bool { return w.kicks[i].time < w.kicks[j].time })
	return nil
}

// ApplyImpulse changes a dynamic body's velocity now by an impulse J (N s)
// at world point p.
func (w *World) ApplyImpulse(id BodyID, j, p shapes.Vec3) {
	if w.b.kind[id] != Dynamic {
		return
	}
	w.b.vel[id] = w.b.vel[id].Add(j.Mul(w.b.invM[id]))
	_, inv := w.inertiaWorld(id)
	w.b.spin[id] = w.b.spin[id].Add(inv.Mul3x1(p.Sub(w.b.pos[id]).Cross(j)))
	w.wake(id)
}

// DivergenceError reports a simulation that blew up.
type DivergenceError struct {
	Body  BodyID
	Name  string
	Time  float64
	Cause string
}

func (e *DivergenceError) Error() string {
	return fmt.Sprintf("simulation diverged at t = %.6g s on body %q: %s", e.Time, e.Name, e.Cause)
}

// Err returns the error that stopped the world, if any.
func (w *World) Err() error { return w.err }

// Step advances the world by dt seconds (in Config.SubSteps equal steps).
// After an error the world stays stopped and returns the same error.
func (w *World) Step(dt float64) error {
	if w.err != nil {
		return w.err
	}
	if !(dt > 0) || math.IsInf(dt, 0) {
		return fmt.Errorf("step: time step must be positive, got %g", dt)
	}
	h := dt / float64(w.cfg.SubSteps)
	for s := 0; s < w.cfg.SubSteps; s++ {
		// Compliant contacts split the step to follow the contact (compliant.go); n is 1 without them.
		n, err := w.softSplit(h)
		for k := 0; k < n && err == nil; k++ {
			err = w.step(h / float64(n))
		}
		if err != nil {
			w.err = err
			return err
		}
	}
	return nil
}

func (w *World) step(dt float64) error {
	w.readyGates()          // gate.go
	w.applyMotorChanges(dt) // scheduled motors (schedule.go)
	w.drive(dt)             // driven kinematic bodies: velocities for this step (driver.go)
	e0, k0, rot0, pot0 := 0.0, 0.0, 0.0, 0.0
	guard := !w.cfg.NoDivergenceCheck
	driven := w.driven()
	if guard {
		var lin0 float64
		lin0, rot0, pot0 = w.startEnergies() // (active.go)
		k0 = lin0 + rot0
		e0 = k0 + pot0
	}
	kicked := w.applyKicks(dt)

	g := w.cfg.Gravity.Mul(dt)
	for _, id := range w.awakeBodies() {
		if w.b.kind[id] == Dynamic {
			w.b.vel[id] = w.b.vel[id].Add(g)
		}
	}
	w.noteFlight() // flight.go

	w.collide(dt)
	if w.soft.on { // compliant contact forces (compliant.go)
		if err := w.applySoft(dt); err != nil {
			return err
		}
		w.markForced() // flight.go
		// The springs hold energy the guard cannot see; sub-stepping from
		// their natural period keeps them stable instead.
		kicked = kicked || w.softActive()
	}
	// A deferred impact (contact.Solver) gives back next step the energy its
	// speculative stop took this step, and stops of other points in the
	// steps between can hold more back meanwhile, so the guard measures
	// against the largest of this step's start and the last few steps'
	// energies before their solves (preSolveLog).
	ePre := 0.0
	switch {
	case guard && kicked:
		lin, rot, pot := w.awakeEnergies()
		ePre = lin + rot + pot
	case guard:
		// Only gravity has changed the velocities since e0: the spins and
		// positions, so the rotational and potential parts, are as they were
		// (a body woken meanwhile had no spin and its potential energy was
		// in the sleepers' share of pot0).
		ePre = w.awakeLinear() + rot0 + pot0
	}
	if err := w.solve(dt); err != nil {
		return err
	}
	work := 0.0
	if driven {
		if err := w.checkJam(dt); err != nil {
			return err
		}
		work = w.drivenWork() // work.go
	}
	w.integrate(dt)
	if w.ledger.fault != nil {
		w.ledger.fault(w) // the ledger's tests inject a gain (ledger.go)
	}
	w.countGates(dt)  // gate.go
	w.advanceTime(dt) // clock.go
	w.steps++
	w.updateRest(dt)

	if err := w.checkFinite(); err != nil {
		return err
	}
	if guard {
		if err := w.checkConing(dt); err != nil { // fast tops (coning.go)
			return err
		}
	}
	if guard && !kicked {
		if err := w.checkEnergy(max(e0, w.preSolve.max())+work, k0); err != nil {
			return err
		}
		if err := w.checkLedger(e0, ePre, work, dt); err != nil { // over many steps (ledger.go)
			return err
		}
	} else {
		w.ledger.on = false
	}
	w.preSolve.add(ePre)
	return nil
}

// driven reports whether something outside the bodies can do work on them
// (moving kinematic bodies, motors, conveyors), so energy need not decrease
// by itself: the guard then allows for the work they do (work.go).
func (w *World) driven() bool {
	if w.mechanismDriven() { // motors, driven bodies, conveyors (joint.go)
		return true
	}
	for _, id := range w.awakeBodies() {
		if w.b.kind[id] == Kinematic && (w.b.vel[id] != (shapes.Vec3{}) || w.b.spin[id] != (shapes.Vec3{})) {
			return true
		}
	}
	return false
}

// applyKicks applies the kicks due in [time, time+dt) and reports whether any was.
func (w *World) applyKicks(dt float64) bool {
	any := false
	for len(w.kicks) > 0 && w.kicks[0].time < w.time+dt {
		k := w.kicks[0]
		w.kicks = w.kicks[1:]
		at := w.b.pos[k.body]
		if k.hasAt {
			at = k.at
		}
		w.ApplyImpulse(k.body, k.impulse, at)
		any = true
	}
	return any
}

// integrate moves the awake bodies: semi-implicit Euler for translation,
// the free-rotation splitting for orientation, plus the position
// correction's pseudo-velocities, which are then dropped.
func (w *World) integrate(dt float64) {
	for _, id := range w.awakeBodies() {
		i, k := int(id), w.b.kind[id]
		vp, wp := w.pseudoVelocity(id)
		w.b.pos[i] = w.b.pos[i].Add(w.b.vel[i].Add(vp).Mul(dt)).Add(w.flightDrift(i, dt))
		q := w.b.rot[i]
		if k == Dynamic {
			var qp shapes.Quat
			qp, w.b.spin[i] = w.freeTurn(id, dt)
			q = qmulConj(&qp, &w.b.axes[i])
		} else {
			q = integrateQuat(q, w.b.spin[i], dt)
		}
		if wp != (shapes.Vec3{}) {
			before := q
			q = integrateQuat(q, wp, dt)
			if k == Dynamic {
				// The correction turns the body without a torque: keep its
				// spin angular momentum, as a real rotation would (the
				// body-frame angular velocity is carried along unchanged).
				wb := qrotateInv(&before, &w.b.spin[i])
				w.b.spin[i] = qrotate(&q, &wb)
			}
		}
		w.b.rot[i] = q.Normalize()
	}
}

// checkFinite stops the run on the first body whose state is not finite.
func (w *World) checkFinite() error {
	// The awake bodies, and those that fell asleep at the end of the step;
	// the others have not moved since they were last checked.
	ids := w.awakeBodies()
	for pass := 0; pass < 2; pass++ {
		for _, id := range ids {
			if finiteState(&w.b.pos[id], &w.b.vel[id], &w.b.spin[id], &w.b.rot[id]) {
				continue
			}
			if what := w.notFinite(int(id)); what != "" { // (diverge.go)
				return &DivergenceError{Body: id, Name: w.b.name[id], Time: w.time,
					Cause: "its " + what + " is no longer a finite number; " + stepAdvice}
			}
		}
		ids = w.active.dozed
	}
	w.active.dozed = w.active.dozed[:0]
	return nil
}

// energyJumpFraction is the growth of total energy in one step, as a
// fraction of the kinetic energy plus a floor, above which the run is
// stopped. Contact with e <= 1 and position correction by pseudo-velocities
// cannot add energy, so any large gain is a numerical blow-up.
const energyJumpFraction = 0.5

// checkEnergy compares the energy after the step with e0 before it.
func (w *World) checkEnergy(e0, k0 float64) error {
	lin, rot, pot := w.endEnergies() // (active.go)
	e1 := lin + rot + pot
	if e1-e0 <= energyJumpFraction*(k0+w.energyFloor()) {
		return nil
	}
	worst, gain := BodyID(0), math.Inf(-1)
	for i, k := range w.b.kind {
		if k == Dynamic {
			if ke := w.kinetic(BodyID(i)); ke > gain {
				worst, gain = BodyID(i), ke
			}
		}
	}
	return &DivergenceError{Body: worst, Name: w.b.name[worst], Time: w.time,
		Cause: fmt.Sprintf("the total energy jumped from %.6g J to %.6g J in one step with no kick or drive to explain it, and this body moves with the most kinetic energy (%.4g J); %s", e0, e1, gain, stepAdvice)}
}

// SetGravity changes gravity from the next step on (a slowly tilting
// support can be simulated by turning gravity instead of the support).
func (w *World) SetGravity(g shapes.Vec3) error {
	if !finiteVec(g) {
		return fmt.Errorf("gravity must be finite, got %v", g)
	}
	w.cfg.Gravity = g
	w.stateChanged() // (active.go)
	for i, k := range w.b.kind {
		if k == Dynamic {
			w.wake(BodyID(i))
		}
	}
	return nil
}

// finiteState reports whether a body's state is all finite numbers, with
// one test: x - x is 0 for a finite x and NaN for NaN or an infinity, and
// a sum with a NaN is NaN.
func finiteState(p, v, s *shapes.Vec3, q *shapes.Quat) bool {
	z := (p[0] - p[0]) + (p[1] - p[1]) + (p[2] - p[2]) +
		(v[0] - v[0]) + (v[1] - v[1]) + (v[2] - v[2]) +
		(s[0] - s[0]) + (s[1] - s[1]) + (s[2] - s[2]) + (q.W - q.W)
	return z == 0
}
