package contact

import (
	"fmt"
	"math"
)

// Settings are the solver's knobs. The zero value runs nothing; start from
// DefaultSettings and change what the scene asks for.
type Settings struct {
	// VelocityIterations is the largest number of projected Gauss-Seidel
	// sweeps over all rows for the real velocities; they stop earlier once
	// converged (Convergence, Tolerance).
	VelocityIterations int
	// PositionIterations is the number of sweeps of the position pass
	// (pseudo-velocities); 0 disables position correction.
	PositionIterations int
	// Tolerance (m/s) ends the velocity and position iterations early once no
	// row changes its velocity by more than this in a sweep, plus, in the
	// velocity iterations, Convergence times the velocity change its
	// accumulated impulse makes. With both 0 every iteration runs.
	Tolerance float64
	// Convergence is the relative part of the velocity iterations' stopping
	// test: a sweep in which every row changes its impulse by at most this
	// fraction of its accumulated impulse (plus Tolerance as a floor) ends
	// them. A relative test scales with the load, so a tall stack of heavy
	// parts and a light part on a floor stop at the same accuracy.
	Convergence float64
	// MaxBlock: the normal rows of an island of at most this many contact
	// points and no joint rows are solved exactly (block.go) before and
	// after the velocity iterations and before the position iterations;
	// 0 or 1 leaves every island to the sweeps. It also sets the work
	// budget of larger islands: one whose banded system (a tower) factors
	// for no more than the dense system of MaxBlock points is solved
	// exactly too (band.go).
	MaxBlock int

	// Slop (m) is the penetration left alone by the position pass, so that
	// resting contacts stay touching and keep their warm-start keys.
	Slop float64
	// SlopSize, if not 0, caps each point's slop at this fraction of the
	// size (Body.Size) of the smaller moving body it joins (slop.go), so
	// that a small part's slop is as small a part of it as a large one's.
	SlopSize float64
	// Correction is the fraction (0..1] of the penetration beyond Slop that
	// the position pass removes per step.
	Correction float64

	// BounceThreshold (m/s): contacts approaching faster get Newton
	// restitution in the impact phase; slower ones are inelastic.
	BounceThreshold float64
	// BounceSteps adds to BounceThreshold, at a point that persists from
	// the last step, this many steps of the normal acceleration that its
	// bodies' spins give it (bounce.go); 0 adds nothing.
	BounceSteps float64
	// InelasticThreshold (m/s), if not 0, raises the threshold of a point
	// whose rebound, e times its approach, would be no faster than
	// ReboundThreshold (one the step cannot resolve, and every point with
	// e = 0) to this speed, or to ReboundThreshold / e if that is lower
	// (bounce.go). ReboundThreshold 0 means BounceThreshold.
	InelasticThreshold, ReboundThreshold float64
	// ImpactPasses bounds the passes of the impact phase over all pairs;
	// impacts left after the last pass are resolved inelastically by the
	// velocity iterations.
	ImpactPasses int
	// PairIterations bounds the Gauss-Seidel sweeps over the points of one
	// pair when the pair is solved on its own: while its impact is processed,
	// and before the velocity iterations when it has a point without warm
	// start. One point needs one sweep; 0 disables the impact phase.
	PairIterations int

	// WarmStart (0..1) scales the previous step's impulses before they are
	// applied at the start of a step (0 disables warm starting).
	WarmStart float64
	// SlipSpeed (m/s): a new contact whose tangential relative speed exceeds
	// this starts sliding (kinetic friction); slower new contacts start
	// sticking. Persisting contacts switch as described for CreepSpeed.
	SlipSpeed float64
	// CreepSpeed (m/s): a step "fails to hold" a contact when it ends with
	// the friction at the cone's limit and the contact still slipping faster
	// than this. A sticking contact breaks loose (kinetic coefficient from the
	// next step) after two such steps in a row; a sliding one keeps sliding
	// while its steps end so, and sticks again after one that does not. Slip
	// is the criterion, not saturation alone, because in a statically
	// indeterminate manifold a lightly loaded point may sit at its limit while
	// the pair does not move.
	CreepSpeed float64
	// CreepRatio and PatchCreepRatio lower that limit, at a point contact
	// and at a patch, to this fraction of the slip that a friction impulse
	// as large as the contact's normal impulse would take away, if that is
	// less: a limit in proportion to the load and the step (creep.go).
	CreepRatio, PatchCreepRatio float64
}

// DefaultSettings returns the defaults, chosen for parts of millimetres to
// metres in steps of 0.1 to 10 ms:
//
//   - VelocityIterations 10, PositionIterations 4: warm-started, a block
//     held on an incline creeps below 1e-9 m in 1 s. Ten is a cap: the
//     sweeps stop once converged.
//   - Convergence 1e-4, Tolerance 1e-7 m/s: a sweep that changes every
//     impulse by less than 0.01 percent (or a row's velocity by less than
//     0.1 um/s, a micrometre in 10 s) ends the iterations. Resting
//     warm-started scenes stop after one or two sweeps.
//   - MaxBlock 96: islands up to 96 points (a tower of 24 boxes, a carton
//     on a pallet of feet) get the exact normal impulses (block.go). A
//     factorisation of 96 rows costs about as much as ten sweeps over them;
//     larger islands are solved exactly where their system is banded for
//     no more work (a tower of any height), piles are left to the sweeps.
//   - Slop 1e-4 m, Correction 0.2: 0.1 mm is a few percent of a small
//     part; removing 20 percent per step takes a penetration to within 1
//     percent of the slop in 20 steps (0.8^20), gently enough for stacks.
//   - SlopSize 0.01: a point's slop is at most 1 percent of its smaller
//     moving body's radius, so parts below a radius of 100 times the slop
//     (1 cm at 0.1 mm, 2 cm at the engine's 0.2 mm) get a slop that
//     shrinks with them (slop.go); larger parts keep Slop.
//   - BounceThreshold 0.1 m/s: a drop must exceed h = v^2/(2g) = 0.5 mm to
//     bounce, smaller rebounds are below e^2 0.5 mm high; and it is above one
//     step of gravity, g dt, for any step up to 10 ms, so a resting part whose
//     contact is new (no warm start) is never mistaken for an impact.
//   - ImpactPasses 20: an impact travels through a chain of up to 20 bodies
//     in any point order; a pass only costs work while something impacts.
//   - PairIterations 32: a box landing flat and sliding on 4 points
//     converges to 1e-13 of the impact speed in 24 sweeps (measured).
//   - WarmStart 1: a resting contact carries exactly last step's load (scaled
//     by the ratio of step sizes), which is what keeps an incline block stuck.
//   - SlipSpeed 0.1 m/s: above g dt for steps up to 10 ms, so a part set down
//     at rest starts with static friction; a contact misjudged as sticking
//     costs at most one step of static friction before it is seen to slide.
//   - CreepSpeed 1e-4 m/s, CreepRatio 0.02, PatchCreepRatio 0.01: a part
//     held at the limit can creep at most 0.1 mm/s before it counts as
//     sliding, five times below the 0.5 mm/s incline acceptance; below
//     that the limit follows the load's velocity change per step, about
//     g dt (creep.go), because so does the slip that the steps of a block
//     held near its static limit leave (measured: on four point contacts
//     pushed at 0.999 mu_s up to 0.0056 g dt, the saturated corners
//     changing during the sweeps; on a face's patch, whose friction is one
//     exact 3x3 update, 4e-8 g dt at rest, but a 2 m block set down on a
//     moving table at 0.1 ms broke loose at 3e-3 and held at 5e-3). A part
//     breaking loose at a, the static coefficient holding it a little
//     short, keeps that coefficient for about ratio g / a steps: 30 steps
//     at tan(theta) = 1.001 mu_s for steps up to 1.6 ms, 3 ms at 0.1 ms
//     (a fixed 1e-4 m/s: 20 ms at any step of 0.5 ms or less).
func DefaultSettings() Settings {
	return Settings{
		VelocityIterations: 10,
		PositionIterations: 4,
		Tolerance:          1e-7,
		Convergence:        1e-4,
		MaxBlock:           96,
		Slop:               1e-4,
		SlopSize:           0.01,
		Correction:         0.2,
		BounceThreshold:    0.1,
		ImpactPasses:       20,
		PairIterations:     32,
		WarmStart:          1,
		SlipSpeed:          0.1,
		CreepSpeed:         1e-4,
		CreepRatio:         0.02,
		PatchCreepRatio:    0.01,
	}
}

// Validate reports the first setting out of range.
func (s Settings) Validate() error {
	bad := func(name string, v any, want string) error {
		return fmt.Errorf("contact: setting %s = %v: %s", name, v, want)
	}
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	switch {
	case s.VelocityIterations < 0:
		return bad("VelocityIterations", s.VelocityIterations, "must be 0 or more")
	case s.MaxBlock < 0:
		return bad("MaxBlock", s.MaxBlock, "must be 0 or more")
	case s.PositionIterations < 0:
		return bad("PositionIterations", s.PositionIterations, "must be 0 or more")
	case s.ImpactPasses < 0:
		return bad("ImpactPasses", s.ImpactPasses, "must be 0 or more")
	case s.PairIterations < 0:
		return bad("PairIterations", s.PairIterations, "must be 0 or more")
	case !finite(s.Tolerance) || s.Tolerance < 0:
		return bad("Tolerance", s.Tolerance, "must be a finite speed >= 0 (m/s)")
	case !finite(s.Convergence) || s.Convergence < 0:
		return bad("Convergence", s.Convergence, "must be a finite fraction >= 0")
	case !finite(s.Slop) || s.Slop < 0:
		return bad("Slop", s.Slop, "must be a finite length >= 0 (m)")
	case !finite(s.SlopSize) || s.SlopSize < 0:
		return bad("SlopSize", s.SlopSize, "must be a finite fraction >= 0")
	case !finite(s.Correction) || s.Correction < 0 || s.Correction > 1:
		return bad("Correction", s.Correction, "must be a fraction in [0, 1]")
	case !finite(s.BounceThreshold) || s.BounceThreshold < 0:
		return bad("BounceThreshold", s.BounceThreshold, "must be a finite speed >= 0 (m/s)")
	case !finite(s.InelasticThreshold) || s.InelasticThreshold < 0:
		return bad("InelasticThreshold", s.InelasticThreshold, "must be a finite speed >= 0 (m/s)")
	case !finite(s.ReboundThreshold) || s.ReboundThreshold < 0:
		return bad("ReboundThreshold", s.ReboundThreshold, "must be a finite speed >= 0 (m/s)")
	case !finite(s.BounceSteps) || s.BounceSteps < 0:
		return bad("BounceSteps", s.BounceSteps, "must be a finite number of steps >= 0")
	case !finite(s.WarmStart) || s.WarmStart < 0 || s.WarmStart > 1:
		return bad("WarmStart", s.WarmStart, "must be a fraction in [0, 1]")
	case !finite(s.SlipSpeed) || s.SlipSpeed < 0:
		return bad("SlipSpeed", s.SlipSpeed, "must be a finite speed >= 0 (m/s)")
	case !finite(s.CreepSpeed) || s.CreepSpeed < 0:
		return bad("CreepSpeed", s.CreepSpeed, "must be a finite speed >= 0 (m/s)")
	case !finite(s.CreepRatio) || s.CreepRatio < 0:
		return bad("CreepRatio", s.CreepRatio, "must be a finite fraction >= 0")
	case !finite(s.PatchCreepRatio) || s.PatchCreepRatio < 0:
		return bad("PatchCreepRatio", s.PatchCreepRatio, "must be a finite fraction >= 0")
	}
	return nil
}
