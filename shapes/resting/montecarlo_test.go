package resting

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// A sampled cross-check of the exact solid angles: mcSamples gravity
// directions, uniform on the sphere (normalised Gaussian triples; Muller,
// "A note on a method for generating points uniformly on n-dimensional
// spheres", CACM 2(4), 1959, cited from memory), each given to the face its ray from com
// pierces and then to the face that face rolls to. Each fraction must lie
// within mcSigmas binomial standard deviations, sqrt(p (1 - p) / N), of the
// exact share: with a few dozen comparisons, 4 sigma makes a chance failure
// (about 6e-5 each) negligible while a wrong solid angle of 1 percent on a
// share of 0.1 (0.0010 off, against a sigma of 0.00067) already fails.
const (
	mcSamples = 200000
	mcSigmas  = 4
)

func randomDirection(rng *rand.Rand) vec {
	for {
		u := vec{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		if l := u.Len(); l > 1e-9 {
			return u.Mul(1 / l)
		}
	}
}

func checkShare(t *testing.T, what string, count int, p float64) {
	t.Helper()
	got := float64(count) / mcSamples
	sigma := math.Sqrt(p * (1 - p) / mcSamples)
	if math.Abs(got-p) > mcSigmas*sigma+1/float64(mcSamples) {
		t.Errorf("%s: sampled %.5f, exact %.5f (%.1f sigma)", what, got, p, math.Abs(got-p)/sigma)
	}
}

func TestMonteCarloHulls(t *testing.T) {
	rng := rand.New(rand.NewPCG(2024, 7))
	wedge := polyHull(t, []vec{{0, -1, 0}, {4, -1, 0}, {-3, -1, 1}, {0, 1, 0}, {4, 1, 0}, {-3, 1, 1}},
		[][]int32{{0, 1, 4, 3}, {1, 2, 5, 4}, {2, 0, 3, 5}, {0, 1, 2}, {3, 4, 5}})
	tetra := polyHull(t, []vec{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {-2, -1.5, 1}},
		[][]int32{{0, 1, 2}, {0, 1, 3}, {1, 2, 3}, {2, 0, 3}})
	box, err := boxHull(shapes.Box{Half: vec{1, 2, 3}})
	if err != nil {
		t.Fatal(err)
	}
	randomHull, randomCom := randomPart(t, rand.New(rand.NewPCG(3, 4)), 16)
	cases := []struct {
		name string
		h    *shapes.Hull
		com  vec
	}{
		{"wedge", wedge, vec{1.0 / 3, 0, 1.0 / 3}},
		{"tetrahedron", tetra, vec{-0.25, -0.125, 0.25}},
		{"hexagon, com low", prismHull(t, regularPolygon(6, 1, 0), 2), vec{0, -0.7, 0}},
		{"box, offset com", box, vec{0.3, -0.2, 0.5}},
		{"random part", randomHull, randomCom},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			faces, err := OfHull(c.h, c.com)
			if err != nil {
				t.Fatal(err)
			}
			direct := make([]int, len(faces))
			final := make([]int, len(faces))
			for s := 0; s < mcSamples; s++ {
				u := randomDirection(rng)
				// The ray c + t u leaves the convex hull through the face
				// whose plane it reaches first.
				best, bf := math.Inf(1), -1
				for fi, f := range c.h.Faces {
					if nu := f.Normal.Dot(u); nu > 0 {
						if tt := (f.Offset - f.Normal.Dot(c.com)) / nu; tt < best {
							best, bf = tt, fi
						}
					}
				}
				direct[bf]++
				final[faces[bf].RollsTo]++
			}
			for fi, f := range faces {
				checkShare(t, "direct share", direct[fi], f.Direct)
				checkShare(t, "probability", final[fi], f.Probability)
			}
		})
	}
}

func TestMonteCarloRound(t *testing.T) {
	// Cylinders and a capsule with com off the axis, where the caps' solid
	// angles come from the trapezoidal integral: rays are cast against the
	// cylinder |z| <= l, x^2 + y^2 <= r^2 and leave through a cap or the side.
	rng := rand.New(rand.NewPCG(99, 1))
	cases := []struct {
		name    string
		s       shapes.Shape
		r, l    float64
		com     vec
		capsule bool
	}{
		{"cylinder, com off axis", shapes.Cylinder{Radius: 1, HalfLength: 0.6}, 1, 0.6, vec{0.5, 0.3, 0.2}, false},
		{"cylinder, com near the rim", shapes.Cylinder{Radius: 1, HalfLength: 2}, 1, 2, vec{0, -0.95, -1.5}, false},
		{"capsule, com off axis", shapes.Capsule{Radius: 1, HalfLength: 1}, 1, 1, vec{0.4, 0, 0.5}, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			faces, err := OfShape(c.s, c.com)
			if err != nil {
				t.Fatal(err)
			}
			var top, bot, side int
			for s := 0; s < mcSamples; s++ {
				u := randomDirection(rng)
				// Distance to the side: |com_xy + t u_xy| = r.
				a := u[0]*u[0] + u[1]*u[1]
				b := c.com[0]*u[0] + c.com[1]*u[1]
				cc := c.com[0]*c.com[0] + c.com[1]*c.com[1] - c.r*c.r
				tSide := math.Inf(1)
				if a > 0 {
					tSide = (-b + math.Sqrt(b*b-a*cc)) / a
				}
				tCap := math.Inf(1)
				if u[2] > 0 {
					tCap = (c.l - c.com[2]) / u[2]
				} else if u[2] < 0 {
					tCap = (-c.l - c.com[2]) / u[2]
				}
				switch {
				case tSide < tCap:
					side++
				case u[2] > 0:
					top++
				default:
					bot++
				}
			}
			if c.capsule {
				checkShare(t, "capsule side direct share", side, faces[0].Direct)
				return
			}
			checkShare(t, "+z cap", top, faces[0].Probability)
			checkShare(t, "-z cap", bot, faces[1].Probability)
			checkShare(t, "side", side, faces[2].Probability)
		})
	}
}
