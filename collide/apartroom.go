package collide

import "clatter/shapes"

// The room of a pair proved apart by its bound (apartbound.go), for a
// caller that tracks how far its bodies have moved: the bound's gap falls
// by at most the relative motion of the shapes, and that motion since the
// proof is at most how far each shape's origin has travelled plus how far
// each has turned times the reach of the other's points from it. While
// the room left exceeds the margin, the bound would prove the pair apart
// again, and the caller can let KeepApart stand for the query.
//
// Why the bound holds, with M the moving shape, F the other, t the pose of
// M's origin in F's frame and q M's orientation there (relMotion): from
// the proof to now, t changes by at most the travel of both origins plus
// F's turn times the distance between the origins then (a vector turned
// by an angle phi moves by 2 sin(phi/2) of its length, at most phi of
// it); the turn between the orientations, an angle that obeys the
// triangle inequality, grows by at most the turns of both shapes, and the
// chord 2 sin(phi/2) rho that relMotion counts for it is subadditive in
// phi on [0, pi]. So the motion relMotion measures now is at most the one
// it measured at the proof plus travel_A + travel_B + (turn_A + turn_B)
// times reach, the distance between the origins at the proof (bounded by
// its l1 length) plus M's radius.

// apartRoom is what the last CollidePair query's bound proof left.
type apartRoom struct {
	ok          bool
	room, reach float64
}

// noteRoom keeps the room of a proof by reference r whose bound left the
// gap left at poses pa, pb: left less twice the l1 band of boundedApart's
// first test. One band is the test's own; the other covers the rounding
// of relMotion here and at a later pose (about 1e-15 of the lengths in the
// band, which is 2e-8 of them), and the growth of the band as the
// positions move (2e-8 sqrt(3) of the travel, which the caller's
// tolerance on the travel covers).
func (d *Detector) noteRoom(r *apartRef, left float64, pa, pb *shapes.Pose) {
	band := 2 * memBand * (r.rsum + l1(&pa.Position) + l1(&pb.Position))
	dp := pb.Position.Sub(pa.Position)
	d.room = apartRoom{ok: true, room: left - 2*band, reach: l1(&dp) + r.rho}
}

// ApartRoom reports, after a CollidePair query that returned no
// manifolds, whether the pair's bound proved it apart, the room it left
// (the gap that motion may close while the bound still proves the pair
// apart beyond the margin) and the reach that multiplies the shapes'
// turns in that motion (the file comment). A later query of the same
// pair and shapes, at a margin m, is proved apart by the bound again when
// room exceeds m plus the travel of both shapes' origins since plus their
// turn (radians) since times reach.
func (d *Detector) ApartRoom() (room, reach float64, ok bool) {
	r := &d.room
	return r.room, r.reach, r.ok
}

// KeepApart stands for the CollidePair query of pair key that the caller
// has shown the pair's bound proves apart (ApartRoom): it keeps the pair's
// memory for the next step, as that query would, and counts it. It
// reports false, and keeps nothing, when the pair's memory holds no bound;
// the caller then runs the query. The query stood for must be of the
// shapes of the proof, and the pair must have returned no manifolds at
// each query since, so that it has no persistent points (persist.go): the
// caller has kept the room of every query since the proof.
func (d *Detector) KeepApart(key uint64) bool {
	c := &d.cache
	h := c.lookup(key)
	if h == nil || h.kind == hintNone || !h.ref.on {
		return false
	}
	c.keepHint(h)
	d.stats.Remembered++
	d.stats.Bounded++
	return true
}
