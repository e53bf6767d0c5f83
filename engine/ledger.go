package engine

import (
	"fmt"
	"math"
)

// The energy ledger: the guard over many steps. checkEnergy stops a step
// that gains much energy at once, but a gain of a few parts per million a
// step (a resting contact that pumps, a spinning body that speeds up) adds
// up over a long run to any amount while each step stays far below its
// threshold. Contacts with e <= 1, friction and position correction only
// take energy out, so the total energy of the dynamic bodies (kinetic plus
// potential, gravity's work included) may not rise, over any stretch of
// steps, by more than the work that drives put in (drivenWork, an upper
// bound) and the rounding and position-correction allowance of the
// per-step guard. The ledger keeps E - W, the energy less the drives'
// work since it began, at the end and before the solve of each step, and
// the lowest value it has reached; a value above that low by more than the
// allowance stops the run.
//
// Energy that a deferred impact holds back for a step or a few and then
// gives back (preSolveLog) is no gain: the low is taken over blocks of
// ledgerWindow consecutive values, each counted at its highest value, so a
// dip shorter than a block never lowers it (every block it touches keeps
// a value from before or after it). A kick, a compliant contact
// (its springs hold energy the sums cannot see), a body added, placed or
// set moving by hand or a change of gravity between steps starts the
// ledger again.

// ledgerWindow is the number of the ledger's consecutive values whose
// highest counts toward its low: the end and pre-solve energies of the
// steps over which the per-step guard lets deferred impacts give energy
// back.
const ledgerWindow = 2 * (preSolveSteps + 1)

// ledgerFraction is the part of the largest kinetic energy since the low
// that the ledger allows on top of the per-step guard's floor and of the
// step's own swing (flightAllowance): the free-rotation splitting keeps
// the energy of a spinning body within a bounded error, not exactly
// (freeRotation), and rounding and stops of resting contacts move a pile's
// energy a little both ways. 5 percent: the valid runs of the test suite
// (bouncing with e = 1, tumbling, pendulums of 1 cm to 10 m at 1/60 s to
// 1 ms, piles, drives) stayed below half the allowance (measured),
// while a gain of ten parts per million a step reaches it in 5000 steps.
const ledgerFraction = 0.05

// energyLedger is the state of the guard over many steps.
type energyLedger struct {
	on    bool
	last  float64 // the energy at the end of the last step checked
	step  int     // that step
	work  float64 // the drives' work since the ledger began, J
	hi    float64 // the highest value of E - W in the current block
	n     int     // values in the current block
	low   float64 // the lowest block high of E - W so far
	lowAt float64 // the time of that low, s
	kin   float64 // the largest kinetic energy since then
	lin   float64 // the largest linear kinetic energy since then
	// fault, nil in every world but the tests', changes the bodies after
	// each step's integration: the tests inject a slow energy gain with it.
	fault func(*World)
	// mass is the dynamic bodies' total mass when there were massN bodies.
	mass  float64
	massN int
	// at holds each body's energy, kinetic plus potential, when the low
	// was last lowered: the body whose energy rose most since then is the
	// one a stop names (culprit).
	at []float64
}

// restart begins the ledger at the start of this step, with energy e0.
func (l *energyLedger) restart(e0 float64) {
	*l = energyLedger{on: true, low: math.Inf(1), fault: l.fault, mass: l.mass, massN: l.massN, at: l.at[:0]}
	l.push(e0)
}

// push adds a value of E - W to the current block of ledgerWindow values
// and, once the block is full, lowers the low to the block's highest.
func (l *energyLedger) push(x float64) {
	if l.n == 0 || x > l.hi {
		l.hi = x
	}
	if l.n++; l.n == ledgerWindow {
		l.low, l.n = min(l.low, l.hi), 0
	}
}

// checkLedger enters the step just taken: e0 its start energy, pre the
// energy before its solve, work the drives' bound for it. It stops the run
// when the energy has risen above the ledger's low by more than allowed.
func (w *World) checkLedger(e0, pre, work, dt float64) error {
	l := &w.ledger
	if !l.on || l.step != w.steps-1 || e0 != l.last {
		l.restart(e0) // the state was changed between steps
	}
	lin, rot, pot := w.active.end[0], w.active.end[1], w.active.end[2] // (endEnergies)
	e1, k1 := lin+rot+pot, lin+rot
	lowStart := l.low
	l.push(pre - l.work)
	l.work += work
	x := e1 - l.work
	lowBefore := l.low
	l.push(x)
	if l.low < lowBefore {
		l.kin, l.lin = k1, lin
	}
	if l.low < lowStart {
		// The low was lowered by either value: the bodies' energies now
		// stand for theirs at it (a block ends on either push).
		l.lowAt = w.time
		l.at = w.bodyEnergies(l.at)
	}
	if k1 > l.kin {
		l.kin = k1
	}
	if lin > l.lin {
		l.lin = lin
	}
	l.last, l.step = e1, w.steps
	gain := x - l.low
	if gain <= ledgerFraction*l.kin { // the common case: no need of the rest
		return nil
	}
	allow := ledgerFraction*l.kin + w.energyFloor() + w.flightAllowance(l.lin, dt)
	if !(gain > allow) {
		return nil
	}
	id, rise := w.culprit()
	return &DivergenceError{Body: id, Name: w.b.name[id], Time: w.time,
		Cause: fmt.Sprintf("the total energy has grown by %.4g J since t = %.6g s with no kick or drive to explain it (allowed %.4g J), and this body's energy rose most, by %.4g J (it now moves with %.4g J); %s",
			gain, l.lowAt, allow, rise, w.kinetic(id), stepAdvice)}
}

// flightAllowance is the swing of the energy that semi-implicit Euler
// itself makes, dt times the largest power of gravity on the bodies: the
// method keeps a modified energy H - (dt/2) v . F instead of H (Hairer,
// Lubich and Wanner, Geometric Numerical Integration, 2006, sec. IX.1),
// so H swings by up to dt/2 |v . F| on either side (a pendulum at 1/240 s
// swung by 3 percent of its kinetic energy). The power is bounded by
// Cauchy-Schwarz, sum m |g . v| <= |g| sqrt(2 M lin), with M the mass of
// the dynamic bodies and lin their largest linear kinetic energy, which
// spares a pass over the bodies.
func (w *World) flightAllowance(lin, dt float64) float64 {
	return dt * w.cfg.Gravity.Len() * math.Sqrt(2*w.dynamicMass()*lin)
}

// dynamicMass is the total mass of the dynamic bodies, kept as the
// guard's floor is (it changes only with the bodies).
func (w *World) dynamicMass() float64 {
	l := &w.ledger
	if l.massN != len(w.b.kind) {
		l.mass, l.massN = 0, len(w.b.kind)
		for i, k := range w.b.kind {
			if k == Dynamic {
				l.mass += w.b.mass[i]
			}
		}
	}
	return l.mass
}

// bodyEnergies fills e with each body's kinetic plus potential energy
// (0 for bodies that are not dynamic), reusing its storage.
func (w *World) bodyEnergies(e []float64) []float64 {
	e = e[:0]
	for i, k := range w.b.kind {
		x := 0.0
		if k == Dynamic {
			x = w.kinetic(BodyID(i)) - w.b.mass[i]*w.cfg.Gravity.Dot(w.b.pos[i])
		}
		e = append(e, x)
	}
	return e
}

// culprit returns the dynamic body whose energy rose most since the
// ledger's low, and that rise: the total says that energy came from
// nowhere, this body says where it went. The body moving fastest, named
// before, was often one that merely kept its energy (a flywheel beside a
// part that a fault pumped).
func (w *World) culprit() (BodyID, float64) {
	at := w.ledger.at
	worst, top := BodyID(0), math.Inf(-1)
	for i, k := range w.b.kind {
		if k != Dynamic || i >= len(at) {
			continue
		}
		e := w.kinetic(BodyID(i)) - w.b.mass[i]*w.cfg.Gravity.Dot(w.b.pos[i])
		if rise := e - at[i]; rise > top {
			worst, top = BodyID(i), rise
		}
	}
	return worst, top
}
