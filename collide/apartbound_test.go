package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// TestApartBoundSameResults: a pair that creeps toward contact in small
// steps is proved apart by the bound of conservative advancement (Mirtich
// 1996, ch. 2: a gap closes no faster than the relative motion of the
// shapes' points) for most of its approach, and CollidePair still returns
// exactly what Collide returns at every step, including the first step in
// contact. Each case closes the gap by a different motion, so that leaving
// one out of the bound (the translation, the turn of the moving shape, the
// turn of the face's owner) makes the bound prove apart a pair in contact.
//
// It checks the room of a proof too (apartroom.go): while the room of the
// last proof exceeds the margin plus the travel of both shapes' origins
// since plus their turn since times the reach, the query is the bound's
// proof (no manifold, and Stats.Bounded counts it), which is what
// KeepApart stands for; a room that left out the travel, either turn or
// the reach of a turn of the face's owner claims a pair apart that the
// bound does not prove.
func TestApartBoundSameResults(t *testing.T) {
	rng := rand.New(rand.NewSource(41))
	ss := cacheShapes(t, rng)
	// A gap of 5 mm closed in about 200 steps: 25 um a step, a tenth of the
	// margin below, as a part settling in a pile moves.
	const steps, margin = 400, 2.5e-4
	cases := []struct {
		name         string
		spinA, spinB float64 // turn of A and of B a step (rad)
	}{
		{"B slides toward A", 0, 0},
		{"and turns", 0, 4e-4},
		{"and A turns", 4e-4, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for i, a := range ss {
				for j, b := range ss {
					cached, plain := NewDetector(), NewDetector()
					cached.warm.off = true // the warm start changes results within GJK's tolerance (TestWarmGJKMatchesCold)
					var r1, r2 []Manifold
					apart, touched := 0, false
					// B starts on A's +x side, 5 mm apart, and slides in
					// at 25 um a step while the shapes turn.
					x0 := 0.2
					if d := plain.Distance(a.(shapes.Convex), shapes.Pose{Orientation: mgl64.QuatIdent()}, b.(shapes.Convex), shapes.Pose{Position: vec3{x0, 0.003, -0.002}, Orientation: mgl64.QuatIdent()}); d.Distance > 0 {
						x0 -= d.Distance - 0.005
					}
					pose := func(s int) (shapes.Pose, shapes.Pose) {
						f := float64(s)
						pa := shapes.Pose{Orientation: mgl64.QuatRotate(tc.spinA*f, vec3{0.1, -0.3, 1}.Normalize())}
						pb := shapes.Pose{Position: vec3{x0 - 2.5e-5*f, 0.003, -0.002}, Orientation: mgl64.QuatRotate(tc.spinB*f, vec3{0.2, 0.3, 1}.Normalize())}
						return pa, pb
					}
					var room roomCheck
					for s := 0; s < steps; s++ {
						pa, pb := pose(s)
						if s > 0 {
							qa, qb := pose(s - 1)
							room.move(qa, pa, qb, pb)
						}
						bounded := cached.Stats().Bounded
						r1 = cached.CollidePair(r1[:0], 1, a, pa, b, pb, margin)
						r2 = plain.Collide(r2[:0], a, pa, b, pb, margin)
						if !sameManifolds(r1, r2) {
							t.Fatalf("%T on %T, step %d: with the bound %+v, without %+v", a, b, s, r1, r2)
						}
						if !room.check(cached, margin, len(r1) == 0 && cached.Stats().Bounded == bounded+1) {
							t.Fatalf("%T on %T, step %d: room %.6g after motion %.6g, but the bound does not prove the pair apart", a, b, s, room.room, room.moved)
						}
						if len(r2) == 0 {
							apart++
						} else {
							touched = true
						}
						cached.NextStep()
					}
					st := cached.Stats()
					if !touched {
						t.Errorf("%d, %d (%T, %T): never touched: the case does not test the end of the bound", i, j, a, b)
					}
					// Most steps that the remembered axis proves apart are
					// proved by the bound, without measuring the axis.
					if st.Bounded < st.Remembered/2 || apart > 100 && st.Remembered > 0 && st.Bounded == 0 {
						t.Errorf("%T on %T: %d steps apart, %d proved by the axis, %d of them by the bound", a, b, apart, st.Remembered, st.Bounded)
					}
					if st.Bounded > 10 && room.skipped == 0 {
						t.Errorf("%T on %T: the bound proved %d queries apart, the room none", a, b, st.Bounded)
					}
				}
			}
		})
	}
}

// roomCheck follows the room of a pair's last bound proof (ApartRoom) as
// a caller that skips the pair's queries while it lasts would.
type roomCheck struct {
	room, reach, moved float64 // the last proof's room and the motion since
	ok                 bool
	skipped            int
}

// move adds the motion of shapes A and B from poses qa, qb to pa, pb: the
// travel of their origins and their turns (the angles themselves) times
// the reach.
func (r *roomCheck) move(qa, pa, qb, pb shapes.Pose) {
	r.moved += pb.Position.Sub(qb.Position).Len() + pa.Position.Sub(qa.Position).Len() +
		(turnAngle(qa.Orientation, pa.Orientation)+turnAngle(qb.Orientation, pb.Orientation))*r.reach
}

// check reports, after a query of d at margin, false if the room claimed
// the pair apart and the query was not the bound's proof (proved); a
// query the room did not skip starts it anew.
func (r *roomCheck) check(d *Detector, margin float64, proved bool) bool {
	if r.ok && r.room-r.moved > margin {
		r.skipped++
		return proved
	}
	r.room, r.reach, r.ok = d.ApartRoom()
	r.moved = 0
	return true
}

// turnAngle is the angle of the rotation from q0 to q1.
func turnAngle(q0, q1 mgl64.Quat) float64 {
	v := q1.Mul(q0.Conjugate()).V
	return 2 * math.Asin(min(1, v.Len()))
}
