package engine

import (
	"math"

	"clatter/shapes"
)

// Pairs apart, skipped while their bodies have not moved enough to touch.
// Most pairs of a resting pile that the broad phase reports are apart, and
// the narrow phase proves each apart again every step by the bound on how
// far its gap can have closed since the remembered axis measured it
// (collide/apartbound.go), a relative pose and a few dozen flops a pair.
// Here the world keeps, for each pair the bound proved apart, the room the
// bound left (collide.Detector.ApartRoom), and each body's travel and turn
// summed over the steps (from the shape poses the narrow phase is given);
// while the room exceeds the step's margin plus the travel and turn of the
// two bodies since the proof, the bound would prove the pair apart again,
// and KeepApart stands for the query: the pair's memory is kept and no
// manifold is made, exactly as the query would do. This is conservative
// advancement (Mirtich, "Impulse-based Dynamic Simulation of Rigid Body
// Systems", PhD thesis, UC Berkeley, 1996, ch. 2) with the bodies' motion
// summed from their poses instead of bounded from their velocities, so that
// position corrections and hand-placed poses count too.

// apartSkip holds the bodies' summed motion and the pairs' rooms.
type apartSkip struct {
	// moves: by body, the summed motion of its shape pose since the poses
	// were last taken all anew, over the steps that began with rooms kept.
	moves []bodyMotion
	// prev: the rooms of last step's pairs, and cur this step's, sorted
	// by key.
	prev, cur []apartRoom
	cursor    int
	// off turns the skip off, and skipped counts the queries skipped: the
	// tests compare a world with the skip and one without.
	off     bool
	skipped int
}

// bodyMotion is how far a body's shape pose has moved: the summed
// distance its origin has travelled and angle (radians, a bound) it has
// turned through.
type bodyMotion struct{ travel, turn float64 }

// apartRoom is the room of one pair proved apart: the pair is apart while
// lim exceeds the margin plus (1 + skipTol) times the summed travel of its
// bodies plus their summed turn times reach. lim is the room the bound
// left plus that sum at the proof, so that a step compares the sums
// themselves rather than their growth since (the same up to the rounding
// of the sums, which skipTol covers).
type apartRoom struct {
	key        uint64
	lim, reach float64
}

// skipTol is the relative tolerance on the summed motion: the rounding of
// the sums, the angle bound and the growth of the bound's band with the
// positions (collide/apartroom.go) are all far below it.
const skipTol = 1e-6

// turnFloor is added to each step's turn angle: the rounding of the
// quaternion product it is taken from (a few 1e-16 of a unit).
const turnFloor = 1e-15

// resetMotion starts the sums anew for n bodies and forgets the rooms: the
// poses were taken all anew (bodies added or placed by hand).
func (s *apartSkip) resetMotion(n int) {
	s.moves = append(s.moves[:0], make([]bodyMotion, n)...)
	s.prev, s.cur = s.prev[:0], s.cur[:0]
	s.cursor = 0
}

// tracking reports whether the bodies' motion is summed: while rooms are
// kept. A room compares the sums with their values at its proof, so the
// motion of steps when no room is kept need not be summed.
func (s *apartSkip) tracking() bool { return len(s.prev) > 0 }

// moved adds the motion of body id's shape pose from p0 to p1 (while
// tracking).
func (s *apartSkip) moved(id BodyID, p0, p1 *shapes.Pose) {
	d0, d1, d2 := p1.Position[0]-p0.Position[0], p1.Position[1]-p0.Position[1], p1.Position[2]-p0.Position[2]
	// The vector part of q1 conj(q0) is sin(phi/2) of the turn phi, for
	// either sign of the quaternions; phi = 2 asin(v) <= 2v / (1 - v^2)
	// (asin's series, term by term), and at most pi.
	v := qmulConj(&p1.Orientation, &p0.Orientation).V
	sv := math.Sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
	phi := math.Pi
	if sv < 0.5 {
		phi = 2 * sv / (1 - sv*sv)
	}
	m := &s.moves[id]
	m.travel += math.Sqrt(d0*d0 + d1*d1 + d2*d2)
	m.turn += phi + turnFloor
}

// lookup returns last step's room of pair key, or nil. The pairs come in
// key order, but for those of islands woken during the step (queried
// after the others): a key behind the cursor finds nothing, and its pair
// is queried.
func (s *apartSkip) lookup(key uint64) *apartRoom {
	p, i := s.prev, s.cursor
	for i < len(p) && p[i].key < key {
		i++
	}
	s.cursor = i
	if i < len(p) && p[i].key == key {
		s.cursor++
		return &p[i]
	}
	return nil
}

// moveOf is the summed travel of bodies a and b plus their summed turn
// times reach.
func (s *apartSkip) moveOf(a, b BodyID, reach float64) float64 {
	ma, mb := &s.moves[a], &s.moves[b]
	return ma.travel + mb.travel + (ma.turn+mb.turn)*reach
}

// skipApart reports whether pair a, b (key) at this step's margin is
// apart by its room, and if so keeps the pair's memory in the narrow phase
// and its room for the next step.
func (w *World) skipApart(a, b BodyID, key uint64, margin float64) bool {
	c := &w.collision
	s := &c.skip
	if s.off {
		return false
	}
	r := s.lookup(key)
	if r == nil || !(r.lim-(1+skipTol)*s.moveOf(a, b, r.reach) > margin) {
		return false
	}
	if !c.det.KeepApart(key) {
		return false
	}
	s.keep(*r)
	s.skipped++
	return true
}

// noteApart keeps the room of pair a, b (key) if the narrow phase's bound
// has just proved it apart.
func (w *World) noteApart(a, b BodyID, key uint64) {
	c := &w.collision
	room, reach, ok := c.det.ApartRoom()
	if !ok {
		return
	}
	s := &c.skip
	s.keep(apartRoom{key: key, lim: room + s.moveOf(a, b, reach), reach: reach})
}

// keep keeps room r for the next step. The rooms are kept in key order:
// a pair queried out of it (of an island woken during the step) keeps
// none, and is queried next step.
func (s *apartSkip) keep(r apartRoom) {
	if n := len(s.cur); n > 0 && s.cur[n-1].key >= r.key {
		return
	}
	s.cur = append(s.cur, r)
}

// nextStep makes this step's rooms the ones the next step looks up.
func (s *apartSkip) nextStep() {
	s.prev, s.cur = s.cur, s.prev[:0]
	s.cursor = 0
}
