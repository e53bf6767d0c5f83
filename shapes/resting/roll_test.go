package resting

import (
	"math"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// bruteRoll is a brute-force reference for the roll: it tilts the part in
// small steps of dTheta, each time about the contact point nearest the foot
// of the centre of mass, which is what gravity does to a part with no
// momentum. The contact is the set of vertices within slack of the lowest
// (slack spans the few steps by which a part rocking along an edge or over a
// face drifts off it); the rest is a few lines of plane geometry, nothing
// shared with the event-driven code. It returns the index of the face the
// part ends up flat on, or -1 if it did not settle.
func bruteRoll(h *shapes.Hull, c vec, start int, dTheta float64) int {
	u := h.Faces[start].Normal
	size := 0.0
	for _, v := range h.Vertices {
		size = math.Max(size, v.Sub(c).Len())
	}
	slack := 3 * dTheta * size
	for step := 0; step < int(8/dTheta); step++ {
		top := math.Inf(-1)
		for _, v := range h.Vertices {
			top = math.Max(top, v.Sub(c).Dot(u))
		}
		// Tangent-plane coordinates of the contact points about the foot.
		e1 := u.Cross(vec{1, 0, 0})
		if e1.Len() < 0.5 {
			e1 = u.Cross(vec{0, 1, 0})
		}
		e1 = e1.Normalize()
		e2 := u.Cross(e1)
		var pts [][2]float64
		for _, v := range h.Vertices {
			if r := v.Sub(c); r.Dot(u) >= top-slack {
				pts = append(pts, [2]float64{r.Dot(e1), r.Dot(e2)})
			}
		}
		q, inside := nearestInHull2(pts)
		if inside {
			// Flat on a face: the one facing down.
			best, bf := math.Inf(-1), -1
			for fi, f := range h.Faces {
				if d := f.Normal.Dot(u); d > best {
					best, bf = d, fi
				}
			}
			return bf
		}
		// Tip toward the overhang, p - q, with p the foot (the origin here).
		t := e1.Mul(-q[0]).Add(e2.Mul(-q[1])).Normalize()
		u = u.Mul(math.Cos(dTheta)).Add(t.Mul(math.Sin(dTheta))).Normalize()
	}
	return -1
}

// nearestInHull2 returns the point of the convex hull of pts nearest the
// origin, and whether the origin lies strictly inside it, by brute force over
// every point, segment and triangle.
func nearestInHull2(pts [][2]float64) ([2]float64, bool) {
	cross := func(a, b, c [2]float64) float64 {
		return (b[0]-a[0])*(c[1]-a[1]) - (b[1]-a[1])*(c[0]-a[0])
	}
	var o [2]float64
	for i := range pts {
		for j := i + 1; j < len(pts); j++ {
			for k := j + 1; k < len(pts); k++ {
				a, b, c := pts[i], pts[j], pts[k]
				s := cross(a, b, c)
				if s == 0 {
					continue
				}
				if d0, d1, d2 := cross(a, b, o)*s, cross(b, c, o)*s, cross(c, a, o)*s; d0 > 0 && d1 > 0 && d2 > 0 {
					return o, true
				}
			}
		}
	}
	best, bq := math.Inf(1), [2]float64{}
	for i := range pts {
		if d := math.Hypot(pts[i][0], pts[i][1]); d < best {
			best, bq = d, pts[i]
		}
		for j := i + 1; j < len(pts); j++ {
			a, b := pts[i], pts[j]
			e := [2]float64{b[0] - a[0], b[1] - a[1]}
			ee := e[0]*e[0] + e[1]*e[1]
			if ee == 0 {
				continue
			}
			s := -(a[0]*e[0] + a[1]*e[1]) / ee
			if s <= 0 || s >= 1 {
				continue
			}
			p := [2]float64{a[0] + s*e[0], a[1] + s*e[1]}
			if d := math.Hypot(p[0], p[1]); d < best {
				best, bq = d, p
			}
		}
	}
	return bq, false
}

func TestTetrahedronVertexPivot(t *testing.T) {
	// A skewed tetrahedron: base v0 = (0,0,0), v1 = (1,0,0), v2 = (0,1,0) and
	// apex (-2,-1.5,1), com at the mean of the corners (-1/4, -1/8, 1/4).
	// The foot of com on the base is (-1/4, -1/8): x < 0 and y < 0, so the
	// nearest point of the base triangle is the corner v0, and the part pivots
	// about a vertex, not an edge. The reference is the brute-force tilt.
	verts := []vec{{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {-2, -1.5, 1}}
	h := polyHull(t, verts, [][]int32{{0, 1, 2}, {0, 1, 3}, {1, 2, 3}, {2, 0, 3}})
	com := vec{-0.25, -0.125, 0.25}
	faces, err := OfHull(h, com)
	if err != nil {
		t.Fatal(err)
	}
	if faces[0].Stable {
		t.Fatalf("base is stable; the test needs it unstable")
	}
	for i, f := range faces {
		// bruteStep: 1e-4 rad steps resolve the paths here, whose turns lie
		// degrees apart.
		const bruteStep = 1e-4
		if want := bruteRoll(h, com, i, bruteStep); f.RollsTo != want {
			t.Errorf("face %d (stable %v) rolls to %d, brute force %d", i, f.Stable, f.RollsTo, want)
		}
	}
	checkSums(t, faces)
}

// randomPart returns the hull of a random point cloud (points in a
// squashed, skewed ball so that many faces are unstable) and a random
// centre of mass well inside it.
func randomPart(t *testing.T, rng *rand.Rand, n int) (*shapes.Hull, vec) {
	t.Helper()
	scale := vec{1 + 3*rng.Float64(), 1 + rng.Float64(), 0.3 + rng.Float64()}
	pts := make([]vec, n)
	for i := range pts {
		var p vec
		for {
			p = vec{2*rng.Float64() - 1, 2*rng.Float64() - 1, 2*rng.Float64() - 1}
			if p.Len() <= 1 {
				break
			}
		}
		pts[i] = vec{p[0] * scale[0], p[1] * scale[1], p[2] * scale[2]}
	}
	h, err := shapes.NewHull(pts)
	if err != nil {
		t.Fatal(err)
	}
	// A com between the vertices' mean and a random vertex: inside, and off
	// centre so that the part has unstable faces.
	var mean vec
	for _, v := range h.Vertices {
		mean = mean.Add(v)
	}
	mean = mean.Mul(1 / float64(len(h.Vertices)))
	v := h.Vertices[rng.IntN(len(h.Vertices))]
	return h, mean.Add(v.Sub(mean).Mul(0.6 * rng.Float64()))
}

func TestRollsAgainstBruteForce(t *testing.T) {
	// Random convex parts: every unstable face's RollsTo against the
	// brute-force tilt. Near a watershed of the roll (a path that passes
	// within a step of a corner of the Gauss map) the brute force itself can
	// go either way, so a disagreement is accepted only when a finer brute
	// force sides with the code.
	rng := rand.New(rand.NewPCG(11, 12))
	parts, unstable := 0, 0
	for trial := 0; trial < 30; trial++ {
		h, com := randomPart(t, rng, 8+rng.IntN(12))
		faces, err := OfHull(h, com)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		checkSums(t, faces)
		parts++
		for i, f := range faces {
			if f.Stable {
				continue
			}
			unstable++
			const bruteStep = 2e-4 // coarse step: fast, resolves all but near-watershed paths
			const fineStep = 2e-5  // ten times finer, for the near-watershed ones
			if want := bruteRoll(h, com, i, bruteStep); want != f.RollsTo {
				if fine := bruteRoll(h, com, i, fineStep); fine != f.RollsTo {
					t.Errorf("trial %d face %d rolls to %d, brute force %d (fine %d)", trial, i, f.RollsTo, want, fine)
				}
			}
		}
	}
	if unstable < 50 {
		t.Fatalf("only %d unstable faces in %d parts: the test is too weak", unstable, parts)
	}
	t.Logf("%d parts, %d unstable faces checked", parts, unstable)
}
