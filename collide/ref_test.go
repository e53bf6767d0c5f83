package collide

// Brute-force references for the tests, written independently of the code
// under test: convex hull facets by testing every triple of points, the
// distance of two disjoint polytopes as the least distance over all pairs of
// features, and the separating-axis gap over every candidate axis without
// pruning.

import (
	"math"
	"math/rand"

	"clatter/shapes"
)

// cloud is a point set used as a convex shape through its support function
// (a test double for any shapes.Convex).
type cloud struct{ pts []vec3 }

func (c cloud) Support(d vec3) vec3 {
	best, bi := math.Inf(-1), 0
	for i, p := range c.pts {
		if v := p.Dot(d); v > best {
			best, bi = v, i
		}
	}
	return c.pts[bi]
}

func (c cloud) Bounds() shapes.AABB {
	b := shapes.EmptyAABB()
	for _, p := range c.pts {
		b = b.Extend(p)
	}
	return b
}

func (c cloud) Mass(float64) shapes.Mass { return shapes.Mass{} }

// refPoly is a polytope given by brute force: its facets (triangles,
// outward) and the edges of those facets.
type refPoly struct {
	pts    []vec3
	facets [][3]int
	edges  [][2]int
}

// bruteHull finds every triple of points with all other points on one side
// (points in general position, as random points are).
func bruteHull(pts []vec3) refPoly {
	r := refPoly{pts: pts}
	n := len(pts)
	seen := map[[2]int]bool{}
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			for k := j + 1; k < n; k++ {
				nrm := pts[j].Sub(pts[i]).Cross(pts[k].Sub(pts[i]))
				pos, neg := 0, 0
				for m := 0; m < n; m++ {
					if m == i || m == j || m == k {
						continue
					}
					s := nrm.Dot(pts[m].Sub(pts[i]))
					if s > 0 {
						pos++
					} else if s < 0 {
						neg++
					}
				}
				if pos > 0 && neg > 0 {
					continue
				}
				f := [3]int{i, j, k}
				if pos > 0 {
					f = [3]int{i, k, j}
				}
				r.facets = append(r.facets, f)
				for e := 0; e < 3; e++ {
					a, b := f[e], f[(e+1)%3]
					if a > b {
						a, b = b, a
					}
					if !seen[[2]int{a, b}] {
						seen[[2]int{a, b}] = true
						r.edges = append(r.edges, [2]int{a, b})
					}
				}
			}
		}
	}
	return r
}

// refPointTriangle is the distance from p to triangle abc: the plane
// distance when p projects inside, else the least distance to the edges.
func refPointTriangle(p, a, b, c vec3) float64 {
	n, _ := unit(b.Sub(a).Cross(c.Sub(a)))
	h := p.Sub(a).Dot(n)
	q := p.Sub(n.Mul(h))
	in := true
	for _, e := range [3][2]vec3{{a, b}, {b, c}, {c, a}} {
		if e[1].Sub(e[0]).Cross(q.Sub(e[0])).Dot(n) < 0 {
			in = false
		}
	}
	if in {
		return math.Abs(h)
	}
	return math.Min(refPointSegment(p, a, b), math.Min(refPointSegment(p, b, c), refPointSegment(p, c, a)))
}

func refPointSegment(p, a, b vec3) float64 {
	ab := b.Sub(a)
	t := p.Sub(a).Dot(ab) / ab.Dot(ab)
	t = math.Max(0, math.Min(1, t))
	return p.Sub(a.Add(ab.Mul(t))).Len()
}

// refSegmentSegment: the interior stationary point if it lies inside both
// segments, else the least of the four end-point distances.
func refSegmentSegment(p1, q1, p2, q2 vec3) float64 {
	d1, d2, r := q1.Sub(p1), q2.Sub(p2), p1.Sub(p2)
	a, e, b := d1.Dot(d1), d2.Dot(d2), d1.Dot(d2)
	c, f := d1.Dot(r), d2.Dot(r)
	best := math.Min(math.Min(refPointSegment(p1, p2, q2), refPointSegment(q1, p2, q2)),
		math.Min(refPointSegment(p2, p1, q1), refPointSegment(q2, p1, q1)))
	den := a*e - b*b
	if den > 1e-14*a*e {
		s := (b*f - c*e) / den
		t := (a*f - b*c) / den
		if s >= 0 && s <= 1 && t >= 0 && t <= 1 {
			best = math.Min(best, p1.Add(d1.Mul(s)).Sub(p2.Add(d2.Mul(t))).Len())
		}
	}
	return best
}

// refDistance is the distance between two disjoint polytopes: the least
// over vertex-facet, facet-vertex and edge-edge pairs.
func refDistance(a, b refPoly) float64 {
	best := math.Inf(1)
	for _, f := range b.facets {
		for _, p := range a.pts {
			best = math.Min(best, refPointTriangle(p, b.pts[f[0]], b.pts[f[1]], b.pts[f[2]]))
		}
	}
	for _, f := range a.facets {
		for _, p := range b.pts {
			best = math.Min(best, refPointTriangle(p, a.pts[f[0]], a.pts[f[1]], a.pts[f[2]]))
		}
	}
	for _, ea := range a.edges {
		for _, eb := range b.edges {
			best = math.Min(best, refSegmentSegment(a.pts[ea[0]], a.pts[ea[1]], b.pts[eb[0]], b.pts[eb[1]]))
		}
	}
	return best
}

// refAxes lists every candidate separating axis of two polytopes (up to
// sign): facet normals of both and cross products of every pair of edges.
func refAxes(a, b refPoly) []vec3 {
	var ax []vec3
	for _, p := range []refPoly{a, b} {
		for _, f := range p.facets {
			n, _ := unit(p.pts[f[1]].Sub(p.pts[f[0]]).Cross(p.pts[f[2]].Sub(p.pts[f[0]])))
			ax = append(ax, n)
		}
	}
	for _, ea := range a.edges {
		for _, eb := range b.edges {
			n, l := unit(a.pts[ea[1]].Sub(a.pts[ea[0]]).Cross(b.pts[eb[1]].Sub(b.pts[eb[0]])))
			if l > 1e-12 {
				ax = append(ax, n)
			}
		}
	}
	return ax
}

// refGap is the largest gap between the projections over all candidate
// axes, both signs: positive when the polytopes are disjoint; when they
// overlap its negation is the penetration depth (the least translation lies
// along a face normal of the Minkowski difference, which is one of the
// axes), and the axis is the least-translation direction from A toward B.
func refGap(a, b refPoly) (gap float64, axis vec3) {
	gap = math.Inf(-1)
	for _, n := range refAxes(a, b) {
		maxA, minA, maxB, minB := math.Inf(-1), math.Inf(1), math.Inf(-1), math.Inf(1)
		for _, p := range a.pts {
			v := p.Dot(n)
			maxA, minA = math.Max(maxA, v), math.Min(minA, v)
		}
		for _, p := range b.pts {
			v := p.Dot(n)
			maxB, minB = math.Max(maxB, v), math.Min(minB, v)
		}
		if g := minB - maxA; g > gap {
			gap, axis = g, n
		}
		if g := minA - maxB; g > gap {
			gap, axis = g, n.Mul(-1)
		}
	}
	return gap, axis
}

// gapAlong is the gap between the projections of two point sets on n.
func gapAlong(a, b []vec3, n vec3) float64 {
	maxA, minB := math.Inf(-1), math.Inf(1)
	for _, p := range a {
		maxA = math.Max(maxA, p.Dot(n))
	}
	for _, p := range b {
		minB = math.Min(minB, p.Dot(n))
	}
	return minB - maxA
}

// randomRotation is uniform on SO(3): K. Shoemake, "Uniform random
// rotations", Graphics Gems III, 1992.
func randomRotation(rng *rand.Rand) shapes.Quat {
	u1, u2, u3 := rng.Float64(), rng.Float64(), rng.Float64()
	a, b := math.Sqrt(1-u1), math.Sqrt(u1)
	return shapes.Quat{W: b * math.Cos(2*math.Pi*u3), V: vec3{a * math.Sin(2*math.Pi*u2), a * math.Cos(2*math.Pi*u2), b * math.Sin(2*math.Pi*u3)}}
}

// randomCloud draws n points in an ellipsoid-ish blob of half sizes s.
func randomCloud(rng *rand.Rand, n int, s vec3) []vec3 {
	pts := make([]vec3, n)
	for i := range pts {
		for {
			p := vec3{2*rng.Float64() - 1, 2*rng.Float64() - 1, 2*rng.Float64() - 1}
			if p.Len() <= 1 {
				pts[i] = vec3{p[0] * s[0], p[1] * s[1], p[2] * s[2]}
				break
			}
		}
	}
	return pts
}

func place(pts []vec3, p shapes.Pose) []vec3 {
	out := make([]vec3, len(pts))
	for i, x := range pts {
		out[i] = p.Apply(x)
	}
	return out
}

// insideTol reports whether p lies in polytope r within tol.
func insidePoly(r refPoly, p vec3, tol float64) bool {
	for _, f := range r.facets {
		n, _ := unit(r.pts[f[1]].Sub(r.pts[f[0]]).Cross(r.pts[f[2]].Sub(r.pts[f[0]])))
		if n.Dot(p.Sub(r.pts[f[0]])) > tol {
			return false
		}
	}
	return true
}
