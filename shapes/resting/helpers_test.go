package resting

import (
	"math"
	"testing"

	"clatter/shapes"
)

type vec = shapes.Vec3

// Named tolerances shared by the tests.
const (
	// exactTol: results that the references give in closed form differ only
	// by rounding through a few dozen operations (atan2, sqrt, asin on
	// order-one numbers), well under 1e-13; 1e-12 leaves room.
	exactTol = 1e-12
	// sumTol: the brief requires the stable faces' probabilities to sum to 1
	// within 1e-12.
	sumTol = 1e-12
)

// polyHull builds a hull by hand from vertices and faces given as vertex
// loops in either winding: each loop is turned counter-clockwise seen from
// outside (its Newell normal pointing away from the vertices' centroid) and
// gets its unit normal and plane offset.
func polyHull(t *testing.T, verts []vec, loops [][]int32) *shapes.Hull {
	t.Helper()
	var cen vec
	for _, v := range verts {
		cen = cen.Add(v)
	}
	cen = cen.Mul(1 / float64(len(verts)))
	h := &shapes.Hull{Vertices: verts}
	for _, l := range loops {
		vs := append([]int32(nil), l...)
		n := newell(verts, vs)
		if n.Dot(verts[vs[0]].Sub(cen)) < 0 {
			for i, j := 0, len(vs)-1; i < j; i, j = i+1, j-1 {
				vs[i], vs[j] = vs[j], vs[i]
			}
			n = n.Mul(-1)
		}
		n = n.Normalize()
		var off float64
		for _, v := range vs {
			off += n.Dot(verts[v])
		}
		h.Faces = append(h.Faces, shapes.Face{Normal: n, Offset: off / float64(len(vs)), Verts: vs})
	}
	return h
}

// newell is the (area-weighted) Newell normal of a vertex loop.
func newell(verts []vec, vs []int32) vec {
	var n vec
	for i := range vs {
		p, q := verts[vs[i]], verts[vs[(i+1)%len(vs)]]
		n = n.Add(p.Cross(q))
	}
	return n
}

// prismHull is the right prism over the convex polygon poly (in the xy
// plane, counter-clockwise seen from +z) from z = -l to z = +l. Faces: 0 the
// +z end, 1 the -z end, then the side over poly edge i (poly[i] to poly[i+1])
// as face 2+i.
func prismHull(t *testing.T, poly [][2]float64, l float64) *shapes.Hull {
	t.Helper()
	n := len(poly)
	var verts []vec
	for _, p := range poly {
		verts = append(verts, vec{p[0], p[1], l})
	}
	for _, p := range poly {
		verts = append(verts, vec{p[0], p[1], -l})
	}
	top := make([]int32, n)
	bot := make([]int32, n)
	for i := 0; i < n; i++ {
		top[i] = int32(i)
		bot[i] = int32(n + i)
	}
	loops := [][]int32{top, bot}
	for i := 0; i < n; i++ {
		j := (i + 1) % n
		loops = append(loops, []int32{int32(i), int32(j), int32(n + j), int32(n + i)})
	}
	return polyHull(t, verts, loops)
}

// regularPolygon has n corners on the circle of radius r, the first at angle phase.
func regularPolygon(n int, r, phase float64) [][2]float64 {
	p := make([][2]float64, n)
	for i := range p {
		a := phase + 2*math.Pi*float64(i)/float64(n)
		p[i] = [2]float64{r * math.Cos(a), r * math.Sin(a)}
	}
	return p
}

// rectOnAxis is the solid angle of a rectangle of half-sides p, q seen from
// distance d on its axis, 4 asin(p q / sqrt((p^2 + d^2)(q^2 + d^2)))
// (a standard result of radiometry, quoted from memory).
func rectOnAxis(p, q, d float64) float64 {
	return 4 * math.Asin(p*q/math.Sqrt((p*p+d*d)*(q*q+d*d)))
}

// cornerRect is the signed solid angle of the rectangle with one corner at
// the foot of the viewpoint and the opposite corner at (a, b) in the plane,
// seen from height d. The centred rectangle of half-sides |a|, |b| is four
// congruent corner rectangles, so by symmetry this is a quarter of
// rectOnAxis: asin(a b / sqrt((a^2 + d^2)(b^2 + d^2))); the sign of a b makes
// it odd in each argument, as the integral of an even density from 0 to a
// and 0 to b is.
func cornerRect(a, b, d float64) float64 {
	return math.Asin(a * b / math.Sqrt((a*a+d*d)*(b*b+d*d)))
}

// rectOffAxis is the solid angle of the rectangle [x1, x2] x [y1, y2] seen
// from height d above the point (x0, y0) of its plane, inside the rectangle
// or not: by inclusion and exclusion of the four corner rectangles.
func rectOffAxis(x1, x2, y1, y2, x0, y0, d float64) float64 {
	return cornerRect(x2-x0, y2-y0, d) - cornerRect(x1-x0, y2-y0, d) -
		cornerRect(x2-x0, y1-y0, d) + cornerRect(x1-x0, y1-y0, d)
}

// girardPolygon is the solid angle of a convex planar polygon seen from
// point c, by fanning it into spherical triangles and taking each one's
// area from Girard's theorem, E = A + B + C - pi (the spherical excess; any
// spherical trigonometry text), with the angles between the great circles
// from their tangents.
// Independent of the Van Oosterom and Strackee formula the code uses.
func girardPolygon(pts []vec, c vec) float64 {
	u := make([]vec, len(pts))
	for i, p := range pts {
		u[i] = p.Sub(c).Normalize()
	}
	angle := func(a, b, c vec) float64 {
		tb := b.Sub(a.Mul(a.Dot(b))).Normalize()
		tc := c.Sub(a.Mul(a.Dot(c))).Normalize()
		return math.Acos(math.Max(-1, math.Min(1, tb.Dot(tc))))
	}
	var s float64
	for i := 1; i+1 < len(u); i++ {
		a, b, cc := u[0], u[i], u[i+1]
		s += angle(a, b, cc) + angle(b, cc, a) + angle(cc, a, b) - math.Pi
	}
	return s
}

// regularPolygonOnAxis is the solid angle of a regular n-gon of
// circumradius R seen from distance d on its axis. Split it into 2n right
// spherical triangles (centre, edge midpoint, corner) with angle pi/n at the
// centre and hypotenuse c, cos c = d / sqrt(d^2 + R^2). Napier's rule
// cos c = cot A cot B gives the corner angle B = atan(1 / (cos c tan(pi/n))),
// and Girard's excess of each is pi/n + B - pi/2, so
//
//	Omega = 2 pi - n pi + 2 n atan(sqrt(d^2 + R^2) / (d tan(pi/n))),
//
// which tends to the cone's 2 pi (1 - cos alpha) as n grows (derived here).
func regularPolygonOnAxis(n int, R, d float64) float64 {
	fn := float64(n)
	return 2*math.Pi - fn*math.Pi + 2*fn*math.Atan(math.Hypot(d, R)/(d*math.Tan(math.Pi/fn)))
}

// within fails the test when |got - want| > tol.
func within(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol) {
		t.Errorf("%s = %.17g, want %.17g (|diff| %.3g > %.3g)", what, got, want, math.Abs(got-want), tol)
	}
}

// checkSums verifies the bookkeeping every analysis must satisfy: Direct
// shares sum to 1, stable faces' probabilities sum to 1, unstable faces have
// probability 0 and roll to a stable face, stable faces roll to themselves.
func checkSums(t *testing.T, faces []Face) {
	t.Helper()
	var direct, prob float64
	for i, f := range faces {
		direct += f.Direct
		if f.Stable {
			prob += f.Probability
			if f.RollsTo != i {
				t.Errorf("stable face %d rolls to %d", i, f.RollsTo)
			}
		} else {
			if f.Probability != 0 || f.TipAngleRad != 0 {
				t.Errorf("unstable face %d has probability %g, tip angle %g", i, f.Probability, f.TipAngleRad)
			}
			if f.RollsTo < 0 || f.RollsTo >= len(faces) || !faces[f.RollsTo].Stable {
				t.Errorf("unstable face %d rolls to %d, not a stable face", i, f.RollsTo)
			}
		}
	}
	within(t, "sum of direct shares", direct, 1, sumTol)
	within(t, "sum of stable probabilities", prob, 1, sumTol)
}
