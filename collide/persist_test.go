package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"
	"github.com/go-gl/mathgl/mgl64"
)

// persistSlop is the contact slop of the tests: the engine's default.
const persistSlop = 2e-4

// restingPair is shape B resting on shape A, 50 um deep: A's top at z = 0.
type restingPair struct {
	name   string
	a, b   shapes.Shape
	pa, pb shapes.Pose
}

// restingPairs are the pairs that persistent manifolds serve, each at rest
// with its points away from ties of the full query (reference faces and
// reduce's choices decided by clear margins), so that a fresh query finds
// the same points after a small motion.
func restingPairs(t *testing.T) []restingPair {
	const dip = 5e-5
	up := func(z float64, q shapes.Quat, x, y float64) shapes.Pose {
		return shapes.Pose{Position: vec3{x, y, z - dip}, Orientation: q}
	}
	turn := mgl64.QuatRotate(0.3, vec3{0, 0, 1})
	side := mgl64.QuatRotate(math.Pi/2, vec3{1, 0, 0}).Mul(mgl64.QuatRotate(0.2, vec3{0, 0, 1}))
	floor := shapes.Plane{Normal: vec3{0, 0, 1}}
	box := shapes.Box{Half: vec3{0.05, 0.03, 0.02}}
	slab := shapes.Box{Half: vec3{0.2, 0.2, 0.02}}
	slabAt := shapes.Pose{Position: vec3{0, 0, -0.02}, Orientation: mgl64.QuatIdent()}
	cyl := shapes.Cylinder{Radius: 0.03, HalfLength: 0.04}
	prism := prismHull(t, 6, 0.04, 0.02)
	bigPrism := prismHull(t, 6, 0.3, 0.02)
	ell := ellipsoidHull(t, rand.New(rand.NewSource(3)), 40, vec3{0.05, 0.04, 0.03})
	// An L of two boxes, its long leg lying on the floor.
	ell2 := &shapes.Compound{Pieces: []shapes.Piece{
		{Shape: shapes.Box{Half: vec3{0.06, 0.02, 0.01}}, Pose: shapes.IdentityPose},
		{Shape: shapes.Box{Half: vec3{0.01, 0.02, 0.04}}, Pose: shapes.Pose{Position: vec3{0.05, 0, 0.05}, Orientation: mgl64.QuatIdent()}},
	}}
	return []restingPair{
		{"box on plane", floor, box, shapes.IdentityPose, up(0.02, turn, 0.01, 0.02)},
		{"hexagonal prism on plane", floor, prism, shapes.IdentityPose, up(0.02, turn, 0, 0)},
		{"hull on its lowest vertex on plane", floor, ell, shapes.IdentityPose, up(ell.Bounds().Max[2], mgl64.QuatRotate(math.Pi, vec3{1, 0, 0}), 0, 0)},
		{"cylinder on its cap on plane", floor, cyl, shapes.IdentityPose, up(0.04, turn, 0, 0)},
		{"cylinder on its side on plane", floor, cyl, shapes.IdentityPose, up(0.03, side, 0, 0)},
		{"plane above a box (plane as B)", box, shapes.Plane{Normal: vec3{0, 0, -1}}, shapes.Pose{Position: vec3{0.01, 0.02, -0.02}, Orientation: turn}, up(0, mgl64.QuatIdent(), 0, 0)},
		{"box on box", slab, box, slabAt, up(0.02, turn, 0.01, 0.02)},
		{"hexagonal prism on box", slab, prism, slabAt, up(0.02, turn, 0.02, -0.01)},
		{"box on hexagonal prism", bigPrism, box, slabAt, up(0.02, turn, 0.01, 0.02)},
		{"cylinder on its cap on box", slab, cyl, slabAt, up(0.04, turn, 0.01, 0)},
		{"cylinder on its side on box", slab, cyl, slabAt, up(0.03, side, 0.01, 0)},
		{"ball on box", slab, shapes.Sphere{Radius: 0.02}, slabAt, up(0.02, turn, 0.01, 0)},
		{"compound on plane", floor, ell2, shapes.IdentityPose, up(0.01, turn, 0, 0)},
		{"box on a tessellated floor", NewMesh(gridMesh(8, 0.4, flatZero)), box, shapes.IdentityPose, up(0.02, turn, 0.013, 0.021)},
	}
}

// TestPersistentMatchesFresh: a resting pair that sways and creeps by
// micrometres gets from CollidePair, with persistence on, the contact that
// a fresh query finds (Collide), step by step, while most steps refresh the
// kept points; a second detector fed the same queries gives the same bits.
func TestPersistentMatchesFresh(t *testing.T) {
	// posTol: a refreshed point moves with the shapes and a fresh one is
	// found anew; they part by at most the motion since the full query,
	// which persistence keeps below persistFraction of the slop.
	posTol := persistFraction*persistSlop + 1e-12
	// sepTol: a separation refreshed for the same features is exact up to
	// terms of second order in the motion (2e-5^2 / 0.02 = 2e-8 m, the
	// normal turned by the rotation times the gap): a fortieth of the 2 um
	// bob that a stale separation would miss by.
	const sepTol = 5e-8
	const bob = 2e-6 // m, the vertical sway each other step
	// nTol: the normal turns with the shapes by at most the motion over
	// the smallest size (0.02 m).
	nTol := persistFraction * persistSlop / 0.02
	const margin = 1e-3 // five slops: a resting body's margin and more
	for _, c := range restingPairs(t) {
		t.Run(c.name, func(t *testing.T) {
			rng := rand.New(rand.NewSource(5))
			kept, again, fresh := NewDetector(), NewDetector(), NewDetector()
			kept.SetPersistence(persistSlop)
			again.SetPersistence(persistSlop)
			var r1, r2, r3 []Manifold
			pb := c.pb
			const steps = 64
			for s := 0; s < steps; s++ {
				// Creep for the first half (3 um a step: the motion limit
				// is reached every few steps), then only sway (the age
				// limit calls the full queries).
				if s < steps/2 {
					pb.Position = pb.Position.Add(vec3{3e-6, 1e-6, 0})
				}
				p := pb
				p.Position[2] += bob * float64(s%2)
				axis, _ := unit(vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()})
				p.Orientation = mgl64.QuatRotate(1e-5, axis).Mul(pb.Orientation)
				r1 = kept.CollidePair(r1[:0], 9, c.a, c.pa, c.b, p, margin)
				r2 = again.CollidePair(r2[:0], 9, c.a, c.pa, c.b, p, margin)
				r3 = fresh.Collide(r3[:0], c.a, c.pa, c.b, p, margin)
				kept.NextStep()
				again.NextStep()
				if !sameManifolds(r1, r2) {
					t.Fatalf("step %d: two detectors differ", s)
				}
				if len(r1) != 1 || len(r3) != 1 || r1[0].Count != r3[0].Count || r1[0].SubA != r3[0].SubA || r1[0].SubB != r3[0].SubB {
					t.Fatalf("step %d: kept %+v, fresh %+v", s, r1, r3)
				}
				m1, m3 := r1[0], r3[0]
				if a := math.Acos(math.Min(1, m1.Normal.Dot(m3.Normal))); a > nTol {
					t.Errorf("step %d: normals %.3g rad apart", s, a)
				}
				if d := m1.PatchCenter.Sub(m3.PatchCenter).Len(); d > posTol || math.Abs(m1.PatchRadius-m3.PatchRadius) > posTol {
					t.Errorf("step %d: patch %v r %.6g, fresh %v r %.6g", s, m1.PatchCenter, m1.PatchRadius, m3.PatchCenter, m3.PatchRadius)
				}
				for _, q := range m3.Points[:m3.Count] {
					// The kept point nearest the fresh one.
					best, k := math.Inf(1), 0
					for j, p := range m1.Points[:m1.Count] {
						if d := p.Position.Sub(q.Position).Len(); d < best {
							best, k = d, j
						}
					}
					if best > posTol {
						t.Errorf("step %d: fresh point %v has no kept point within %.3g m (nearest %.3g m)", s, q.Position, posTol, best)
					}
					if d := math.Abs(m1.Points[k].Separation - q.Separation); d > sepTol {
						t.Errorf("step %d: separation %.9g kept, %.9g fresh", s, m1.Points[k].Separation, q.Separation)
					}
					if m1.Points[k].ID != q.ID {
						t.Errorf("step %d: id %d kept, %d fresh", s, m1.Points[k].ID, q.ID)
					}
				}
			}
			// Full queries: every few steps while creeping, every
			// persistAge to persistAgeStill steps while swaying; the rest
			// refreshed.
			// A rolling contact (a ball, a cylinder on its side) is refreshed
			// too, from its support (roll.go).
			st := kept.Stats()
			if st.Persisted < steps/2 || st.Persisted > steps-steps/persistAgeStill {
				t.Errorf("%d of %d queries refreshed", st.Persisted, steps)
			}
		})
	}
}

// TestPersistentRequeries: CollidePair runs the full query when the pair
// moved, aged, its margin grew, a kept point left the margin or the key
// came with other shapes, and never with persistence off.
func TestPersistentRequeries(t *testing.T) {
	tol := persistFraction * persistSlop
	c := restingPairs(t)[0] // box on plane
	rot := func(angle float64) shapes.Quat {
		return mgl64.QuatRotate(angle, vec3{0, 1, 0}).Mul(c.pb.Orientation)
	}
	rho := boundRadius(c.b)
	moved := func(d vec3, q shapes.Quat) shapes.Pose {
		return shapes.Pose{Position: c.pb.Position.Add(d), Orientation: q}
	}
	still := moved(vec3{}, c.pb.Orientation)
	cases := []struct {
		name string
		// The second query: pose of B, margin, shape of B.
		pb     shapes.Pose
		margin float64
		b      shapes.Shape
		// A full query is expected (else a refresh).
		full bool
	}{
		{"still", still, 1e-3, c.b, false},
		{"slid below the limit", moved(vec3{0.9 * tol, 0, 0}, c.pb.Orientation), 1e-3, c.b, false},
		{"slid beyond the limit", moved(vec3{1.1 * tol, 0, 0}, c.pb.Orientation), 1e-3, c.b, true},
		{"turned below the limit", moved(vec3{}, rot(0.9*tol/rho)), 1e-3, c.b, false},
		{"turned beyond the limit", moved(vec3{}, rot(1.1*tol/rho)), 1e-3, c.b, true},
		{"margin grown below the limit", still, 1e-3 + 0.9*tol, c.b, false},
		{"margin grown beyond the limit", still, 1e-3 + 1.1*tol, c.b, true},
		// Lifted 10 um, within the motion limit, to 40 um apart: beyond a
		// 30 um margin, where a fresh query finds nothing.
		{"kept points beyond the margin", moved(vec3{0, 0, 9e-5}, c.pb.Orientation), 3e-5, c.b, true},
		{"other shape under the key", still, 1e-3, shapes.Box{Half: vec3{0.05, 0.03, 0.021}}, true},
		// Poses that are not finite go to the full query, which checks them.
		{"position not finite", moved(vec3{math.NaN(), 0, 0}, c.pb.Orientation), 1e-3, c.b, true},
		{"position infinite", moved(vec3{0, math.Inf(1), 0}, c.pb.Orientation), 1e-3, c.b, true},
		{"orientation not finite", moved(vec3{}, shapes.Quat{W: math.NaN(), V: c.pb.Orientation.V}), 1e-3, c.b, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			d, fresh := NewDetector(), NewDetector()
			d.SetPersistence(persistSlop)
			// The first query is a full one, with margin 1e-3 (0.04 mm for
			// the lifted case, so that its points are kept).
			m0 := 1e-3
			if tc.margin < 1e-4 {
				m0 = 4e-5
			}
			var r, f []Manifold
			r = d.CollidePair(r[:0], 1, c.a, c.pa, c.b, moved(vec3{0, 0, 4e-5}.Mul(boolTo(tc.margin < 1e-4)), c.pb.Orientation), m0)
			d.NextStep()
			if len(r) != 1 || d.Stats().Persisted != 0 {
				t.Fatalf("first query: %+v, %d refreshed", r, d.Stats().Persisted)
			}
			r = d.CollidePair(r[:0], 1, c.a, c.pa, tc.b, tc.pb, tc.margin)
			if got := d.Stats().Persisted == 0; got != tc.full {
				t.Errorf("full query %v, want %v", got, tc.full)
			}
			if tc.full {
				f = fresh.Collide(f[:0], c.a, c.pa, tc.b, tc.pb, tc.margin)
				if !sameManifolds(r, f) {
					t.Errorf("full query %+v, Collide %+v", r, f)
				}
			}
		})
	}
	t.Run("tilted out of the rest band", func(t *testing.T) {
		// A 4 mm hexagonal prism flat on the floor, then tilted by 1.5e-3
		// rad about a corner: within the motion limit (its corners move
		// 7 um), but past restBand's milliradian, where a fresh query may
		// keep other points (restband.go).
		small := prismHull(t, 6, 0.004, 0.002)
		d := NewDetector()
		d.SetPersistence(persistSlop)
		flat := shapes.Pose{Position: vec3{0, 0, 0.002 - 5e-5}, Orientation: mgl64.QuatIdent()}
		var r []Manifold
		r = d.CollidePair(r[:0], 1, c.a, c.pa, small, flat, 1e-3)
		d.NextStep()
		corner := vec3{0.004, 0, -0.002}
		q := mgl64.QuatRotate(1.5e-3, vec3{0, 1, 0})
		tilted := shapes.Pose{Position: flat.Position.Add(corner).Sub(q.Rotate(corner)), Orientation: q}
		if m := q.Rotate(vec3{-0.004, 0, -0.002}).Add(tilted.Position).Sub(vec3{-0.004, 0, flat.Position[2] - 0.002}).Len(); m > tol {
			t.Fatalf("the tilt moves the far corner %.3g m, beyond the motion limit", m)
		}
		r = d.CollidePair(r[:0], 1, c.a, c.pa, small, tilted, 1e-3)
		if d.Stats().Persisted != 0 {
			t.Errorf("refreshed a manifold that tilted out of the rest band: %+v", r)
		}
	})
	t.Run("age", func(t *testing.T) {
		d := NewDetector()
		d.SetPersistence(persistSlop)
		var r []Manifold
		// At rest: full queries at steps 0, persistAgeStill, 3
		// persistAgeStill, 7 persistAgeStill, ... (each finds the same
		// features, so the wait doubles) up to waits of persistAgeMax.
		const n = 4*persistAgeMax + 1
		want, wait := n, persistAgeStill
		for s := 0; s < n; s += wait {
			if s > 0 {
				wait = min(2*wait, persistAgeMax)
			}
			want--
		}
		for s := 0; s < n; s++ {
			r = d.CollidePair(r[:0], 1, c.a, c.pa, c.b, c.pb, 1e-3)
			d.NextStep()
		}
		if got := d.Stats().Persisted; got != want {
			t.Errorf("%d of %d queries refreshed, want %d", got, n, want)
		}
	})
	t.Run("age after a knock", func(t *testing.T) {
		d := NewDetector()
		d.SetPersistence(persistSlop)
		var r []Manifold
		// At rest until the wait has doubled (full queries at 0 and
		// persistAgeStill), then one step moved beyond the motion limit
		// and back: the two full queries of the knock start the wait again
		// from persistAgeStill, so the next falls persistAgeStill after.
		knock := moved(vec3{2 * tol, 0, 0}, c.pb.Orientation)
		const at = persistAgeStill + 10
		const n = at + 1 + persistAgeStill + 1
		for s := 0; s < n; s++ {
			p := c.pb
			if s == at {
				p = knock
			}
			r = d.CollidePair(r[:0], 1, c.a, c.pa, c.b, p, 1e-3)
			d.NextStep()
		}
		if got, want := d.Stats().Persisted, n-5; got != want {
			t.Errorf("%d of %d queries refreshed, want %d", got, n, want)
		}
	})
	t.Run("age while swaying", func(t *testing.T) {
		d := NewDetector()
		d.SetPersistence(persistSlop)
		var r []Manifold
		// B sways between two poses twice persistStill of the motion
		// limit apart: a pose that moved more than persistStill since the
		// full query runs it again once persistAge old, so the full
		// queries fall at steps 0, persistAge+1, 2(persistAge+1), ...
		away := moved(vec3{2 * persistStill * tol, 0, 0}, c.pb.Orientation)
		const n = 3*(persistAge+1) + 1
		for s := 0; s < n; s++ {
			p := c.pb
			if s%2 == 1 {
				p = away
			}
			r = d.CollidePair(r[:0], 1, c.a, c.pa, c.b, p, 1e-3)
			d.NextStep()
		}
		if got := d.Stats().Persisted; got != n-4 {
			t.Errorf("%d of %d queries refreshed, want %d", got, n, n-4)
		}
	})
	t.Run("off", func(t *testing.T) {
		d, fresh := NewDetector(), NewDetector()
		d.SetPersistence(persistSlop)
		d.SetPersistence(0)
		var r, f []Manifold
		for s := 0; s < 20; s++ {
			p := moved(vec3{1e-7 * float64(s), 0, 0}, c.pb.Orientation)
			r = d.CollidePair(r[:0], 1, c.a, c.pa, c.b, p, 1e-3)
			f = fresh.Collide(f[:0], c.a, c.pa, c.b, p, 1e-3)
			d.NextStep()
			if !sameManifolds(r, f) {
				t.Fatalf("step %d: %+v, Collide %+v", s, r, f)
			}
		}
		if d.Stats().Persisted != 0 {
			t.Errorf("%d refreshed with persistence off", d.Stats().Persisted)
		}
	})
}

func boolTo(b bool) float64 {
	if b {
		return 1
	}
	return 0
}
