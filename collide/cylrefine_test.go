package collide

import (
	"math"
	"math/rand"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// TestCylinderRefinedDistance checks the distance and normal of a
// cylinder and a box hull (or a second cylinder) near its rim and side against elementary
// geometry, with the whole scene turned to random orientations and the
// shapes in both orders. In each case the box's nearest feature sits in
// the normal cone of the cylinder's nearest point, so the distance is
// the offset g along that cone's direction n:
//
//   - vertex over the rim: the box's corner at R + g n, R the rim point at
//     45 degrees, n = (1/2, 1/2, 1/sqrt 2) halfway between the radial and
//     axial directions there;
//   - edge over the rim: the box's edge along y through (r, 0, h) + g n,
//     n = (1, 0, 1)/sqrt 2; the distance from the edge's point at y to the
//     rim is sqrt((sqrt((r+a)^2+y^2) - r)^2 + a^2), a = g/sqrt 2, least
//     (= g) at y = 0;
//   - edge along the side: an edge skew to the axis at distance r + g from
//     it, crossing the axis's perpendicular at mid-height;
//   - face under the rim: a face tilted by 30 degrees touching the rim's
//     lowest point along its normal, distance g;
//   - rim over rim: a second cylinder, turned over, with its rim point
//     at (r, 0, h) + g n, n = (1, 0, 1)/sqrt 2, whose normal cone holds -n.
//
// Only the queries that the refinement answered are checked here (the
// others are GJK's, checked in gjk_test.go), and it must answer most.
func TestCylinderRefinedDistance(t *testing.T) {
	const (
		r, h = 0.01, 0.012 // the cylinder of the pour benchmark, m
		// distTol: the stopping test admits cylRound (1e-12) of the
		// coordinates' scale (about 0.06 m here) plus gjkRelTol of the
		// distance; the test's own placement rounds at 1e-17 m.
		distTol = 1e-13
		// normalTol: the length of the difference of the unit normals
		// (radians): the refined points are exact to rounding, which
		// over 0.1 um tilts the normal by about 1e-10.
		normalTol = 1e-9
		// unitTol: v/dist is the caller's normal; |v| and dist must be
		// one number up to the rounding of a square root (a few ulps).
		unitTol = 1e-14
		// minRefined of the 32 queries of each case (4 gaps, 8 turns)
		// must be answered by the refinement: measured 27 to 32 of 32 at
		// the rim and side (near touch, 0.1 um, rounding leaves some to
		// GJK); a face, where GJK converges fast, a third of that (few).
		minRefined = 24
	)
	s2 := math.Sqrt(2)
	type setup struct {
		name string
		n    vec3                 // unit normal from the cylinder toward the box
		box  vec3                 // the box's half sizes
		rot  mat3                 // the box's orientation in the cylinder's frame
		at   func(g float64) vec3 // the box's centre for gap g
		few  int                  // divides minRefined
	}
	tilt := shapes.RotationMatrix(mgl64.QuatRotate(math.Pi/6, vec3{1, 0, 0}))
	tn := mul(tilt, vec3{0, 0, -1}) // the tilted box's bottom face normal, pointing down
	flip := shapes.RotationMatrix(mgl64.QuatRotate(math.Pi, vec3{0, 1, 0}))
	const r2, h2 = 0.008, 0.006 // the second cylinder of rim-rim, m
	cases := []setup{
		{"vertex-rim", vec3{0.5, 0.5, 1 / s2}, vec3{0.004, 0.005, 0.006}, identity3, func(g float64) vec3 {
			p := vec3{r / s2, r / s2, h}.Add(vec3{0.5, 0.5, 1 / s2}.Mul(g))
			return p.Add(vec3{0.004, 0.005, 0.006})
		}, 1},
		{"edge-rim", vec3{1 / s2, 0, 1 / s2}, vec3{0.005, 0.008, 0.005}, identity3, func(g float64) vec3 {
			p := vec3{r, 0, h}.Add(vec3{1, 0, 1}.Mul(g / s2))
			return p.Add(vec3{0.005, 0, 0.005})
		}, 1},
		{"edge-side", vec3{1, 0, 0}, vec3{0.006, 0.006, 0.009}, shapes.RotationMatrix(mgl64.QuatRotate(0.4, vec3{1, 0, 0})).Mul3(shapes.RotationMatrix(mgl64.QuatRotate(math.Pi/4, vec3{0, 0, 1}))), func(g float64) vec3 {
			// The box's edge along its z, turned 45 degrees about z so
			// that the edge faces -x, then tilted 0.4 rad about x: the
			// edge stays in the plane x = r + g.
			return vec3{r + g + 0.006*s2, 0, 0}
		}, 1},
		{"face-rim", tn, vec3{0.02, 0.02, 0.004}, tilt, func(g float64) vec3 {
			// The rim point lowest along tn, and the box's bottom face
			// g beyond it.
			rim := vec3{0, 0, -h}.Add(vec3{tn[0], tn[1], 0}.Normalize().Mul(r))
			// off the face's centre, so that the foot is off its diagonals
			return rim.Add(tn.Mul(g + 0.004)).Add(mul(tilt, vec3{0.007, -0.004, 0}))
		}, 3},
		{"rim-rim", vec3{1 / s2, 0, 1 / s2}, vec3{}, flip, func(g float64) vec3 {
			// A second cylinder (box zero: radius r2, half length h2)
			// turned over about y: its rim point (r2, 0, h2) comes to
			// (-r2, 0, -h2) from its centre, with -n in its normal cone.
			return vec3{r, 0, h}.Add(vec3{1, 0, 1}.Mul(g / s2)).Add(vec3{r2, 0, h2})
		}, 1},
	}
	rng := rand.New(rand.NewSource(3))
	d := NewDetector()
	refined := map[string]int{}
	for _, c := range cases {
		var verts []vec3
		for i := 0; i < 8; i++ {
			v := c.box
			for k := 0; k < 3; k++ {
				if i&(1<<k) == 0 {
					v[k] = -v[k]
				}
			}
			verts = append(verts, v)
		}
		var other shapes.Shape = shapes.Cylinder{Radius: r2, HalfLength: h2}
		if c.box != (vec3{}) {
			hull, err := shapes.NewHull(verts)
			if err != nil {
				t.Fatal(err)
			}
			other = hull
		}
		for _, g := range []float64{1e-7, 1e-5, 3e-4, 2e-3} {
			for k := 0; k < 8; k++ {
				turn := shapes.RotationMatrix(randomRotation(rng))
				var cyl, box view
				cyl.setConvex(shapes.Cylinder{Radius: r, HalfLength: h}, turn, vec3{})
				box.setConvex(other, turn.Mul3(c.rot), mul(turn, c.at(g)))
				n := mul(turn, c.n)
				a, b, sg := &cyl, &box, 1.0
				if k%2 == 1 {
					a, b, sg = &box, &cyl, -1
				}
				got := d.gjkRefined(a, b, false, 1, true)
				if got.overlap || got.apart {
					t.Fatalf("%s g=%g: overlap %v apart %v", c.name, g, got.overlap, got.apart)
				}
				if !got.refined {
					continue // left to GJK: checked in gjk_test.go
				}
				refined[c.name]++
				if e := math.Abs(got.dist - g); e > distTol {
					t.Errorf("%s g=%g order %d: distance %.17g, want %g (error %.3g m)", c.name, g, k%2, got.dist, g, e)
				}
				if e := math.Abs(got.v.Len()/got.dist - 1); e > unitTol {
					t.Errorf("%s g=%g order %d: |v|/dist - 1 = %.3g: the normal v/dist is not a unit vector", c.name, g, k%2, e)
				}
				// v = pa - pb points from B to A.
				gn := got.v.Mul(-sg / got.dist)
				if e := gn.Sub(n).Len(); e > normalTol {
					t.Errorf("%s g=%g order %d: normal off by %.3g rad", c.name, g, k%2, e)
				}
			}
		}
		t.Logf("%s: %d of 32 refined", c.name, refined[c.name])
		if want := minRefined / c.few; refined[c.name] < want {
			t.Errorf("%s: %d of 32 queries refined, want at least %d", c.name, refined[c.name], want)
		}
	}
}
