package collide

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// Tolerances of the patch tests.
const (
	// tolPatchExact: closed forms against the code's sums of closed forms;
	// rounding of a few logarithms and roots.
	tolPatchExact = 1e-9
	// tolPatchGrid: the brute-force reference counts the cells of a 1000 x
	// 1000 grid whose centres fall inside the polygon; the cells cut by the
	// boundary make an error of order one cell over the size, 1e-3.
	tolPatchGrid = 3e-3
)

// gridMeanDistance is the brute-force reference: the mean distance from
// the area centroid over the convex polygon poly (counter-clockwise, in
// the xy plane), by a fine grid, and the centroid.
func gridMeanDistance(poly []pt2) (float64, float64, float64) {
	const n = 1000
	lo, hi := poly[0], poly[0]
	for _, p := range poly {
		lo = pt2{math.Min(lo.x, p.x), math.Min(lo.y, p.y)}
		hi = pt2{math.Max(hi.x, p.x), math.Max(hi.y, p.y)}
	}
	inside := func(x, y float64) bool {
		for i := range poly {
			p, q := poly[i], poly[(i+1)%len(poly)]
			if cross2(q.x-p.x, q.y-p.y, x-p.x, y-p.y) < 0 {
				return false
			}
		}
		return true
	}
	var xs, ys []float64
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			x := lo.x + (float64(i)+0.5)/n*(hi.x-lo.x)
			y := lo.y + (float64(j)+0.5)/n*(hi.y-lo.y)
			if inside(x, y) {
				xs, ys = append(xs, x), append(ys, y)
			}
		}
	}
	var cx, cy, sum float64
	for k := range xs {
		cx, cy = cx+xs[k], cy+ys[k]
	}
	cx, cy = cx/float64(len(xs)), cy/float64(len(xs))
	for k := range xs {
		sum += math.Hypot(xs[k]-cx, ys[k]-cy)
	}
	return sum / float64(len(xs)), cx, cy
}

func floorPlane() shapes.Plane { return shapes.Plane{Normal: vec3{0, 0, 1}} }

// onePatch collides a and b and returns the only manifold.
func onePatch(t *testing.T, a shapes.Shape, pa shapes.Pose, b shapes.Shape, pb shapes.Pose) Manifold {
	t.Helper()
	ms := NewDetector().Collide(nil, a, pa, b, pb, 1e-3)
	if len(ms) != 1 {
		t.Fatalf("%d manifolds, want 1", len(ms))
	}
	return ms[0]
}

func TestPatchRadius(t *testing.T) {
	id := mgl64.QuatIdent()
	at := func(x, y, z float64) shapes.Pose { return shapes.Pose{Position: vec3{x, y, z}, Orientation: id} }
	const pen = 1e-5
	// The mean distance from the centre of a unit square to its points is
	// (sqrt 2 + ln(1 + sqrt 2))/6 = 0.382598 (E. W. Weisstein, "Square
	// Point Picking", MathWorld; from memory); of a disc of radius R, 2R/3
	// (elementary: the integral of r over the disc, 2 pi R^3/3, over pi R^2).
	square := (math.Sqrt2 + math.Log(1+math.Sqrt2)) / 6
	rect, rcx, rcy := gridMeanDistance([]pt2{{-0.15, -0.05}, {0.15, -0.05}, {0.15, 0.05}, {-0.15, 0.05}})
	hexPoly := make([]pt2, 6)
	for k := range hexPoly {
		th := 2 * math.Pi * float64(k) / 6
		hexPoly[k] = pt2{0.04 * math.Cos(th), 0.04 * math.Sin(th)}
	}
	hex, _, _ := gridMeanDistance(hexPoly)
	big := shapes.Box{Half: vec3{1, 1, 0.1}}
	cyl := shapes.Cylinder{Radius: 0.07, HalfLength: 0.02}
	tilt := mgl64.QuatRotate(0.3, vec3{1, 0, 0})
	cases := []struct {
		name   string
		a      shapes.Shape
		pa     shapes.Pose
		b      shapes.Shape
		pb     shapes.Pose
		want   float64
		centre vec3
		tol    float64
	}{
		{"square box on a plane", floorPlane(), at(0, 0, 0), shapes.Box{Half: vec3{0.1, 0.1, 0.02}}, at(0.3, -0.2, 0.02-pen), 0.2 * square, vec3{0.3, -0.2, 0}, tolPatchExact},
		{"plane under a square box", shapes.Box{Half: vec3{0.1, 0.1, 0.02}}, at(0.3, -0.2, 0.02-pen), floorPlane(), at(0, 0, 0), 0.2 * square, vec3{0.3, -0.2, 0}, tolPatchExact},
		{"oblong box on a plane", floorPlane(), at(0, 0, 0), shapes.Box{Half: vec3{0.15, 0.05, 0.02}}, at(rcx, rcy, 0.02-pen), rect, vec3{}, tolPatchGrid},
		{"small box on a big box", big, at(0, 0, -0.1), shapes.Box{Half: vec3{0.1, 0.1, 0.02}}, at(0.2, 0.1, 0.02-pen), 0.2 * square, vec3{0.2, 0.1, 0}, tolPatchExact},
		{"hexagonal prism on a plane", floorPlane(), at(0, 0, 0), prismHull(t, 6, 0.04, 0.01), at(0, 0, 0.01-pen), hex, vec3{}, tolPatchGrid},
		{"disc on a plane", floorPlane(), at(0, 0, 0), cyl, at(0.1, 0.1, 0.02-pen), 2 * 0.07 / 3, vec3{0.1, 0.1, 0}, tolPatchExact},
		{"disc on a box", big, at(0, 0, -0.1), cyl, at(0.1, 0.1, 0.02-pen), 2 * 0.07 / 3, vec3{0.1, 0.1, 0}, tolPatchExact},
		{"box under a disc", cyl, at(0.1, 0.1, 0.02-pen), big, at(0, 0, -0.1), 2 * 0.07 / 3, vec3{0.1, 0.1, 0}, tolPatchExact},
		// On an edge of length L: uniform pressure along a segment has mean
		// distance L/4 from its middle.
		{"box on an edge", floorPlane(), at(0, 0, 0), shapes.Box{Half: vec3{0.1, 0.05, 0.02}},
			shapes.Pose{Position: vec3{0, 0, 0.05*math.Sin(0.3) + 0.02*math.Cos(0.3) - pen}, Orientation: tilt}, 0.2 / 4, vec3{0, -0.05*math.Cos(0.3) + 0.02*math.Sin(0.3), 0}, tolPatchExact},
		{"sphere on a plane", floorPlane(), at(0, 0, 0), shapes.Sphere{Radius: 0.05}, at(0, 0, 0.05-pen), 0, vec3{}, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := onePatch(t, c.a, c.pa, c.b, c.pb)
			if e := math.Abs(m.PatchRadius - c.want); !(e <= c.tol*math.Max(c.want, 1e-300)) && !(c.want == 0 && m.PatchRadius == 0) {
				t.Errorf("patch radius %.9g, want %.9g", m.PatchRadius, c.want)
			}
			if d := m.PatchCenter.Sub(c.centre); math.Hypot(d[0], d[1]) > 1e-9 || math.Abs(d[2]) > pen {
				t.Errorf("patch centre %v, want %v", m.PatchCenter, c.centre)
			}
		})
	}
}

// TestPolygonPatchSquare checks the polygon sum against the closed form for
// squares placed anywhere (the same value about any point of the plane).
func TestPolygonPatchSquare(t *testing.T) {
	square := (math.Sqrt2 + math.Log(1+math.Sqrt2)) / 6 // Weisstein, see TestPatchRadius
	for _, c := range []struct{ x, y, a float64 }{{0, 0, 1}, {3, -2, 0.01}, {-1e3, 5e2, 40}} {
		h := c.a / 2
		poly := []pt2{{c.x - h, c.y - h}, {c.x + h, c.y - h}, {c.x + h, c.y + h}, {c.x - h, c.y + h}}
		gx, gy, r := polygonPatch(poly)
		if math.Abs(r-c.a*square) > tolPatchExact*c.a || math.Abs(gx-c.x) > 1e-9*c.a+1e-12*math.Abs(c.x) || math.Abs(gy-c.y) > 1e-9*c.a+1e-12*math.Abs(c.y) {
			t.Errorf("square %v: centre (%g, %g), radius %.12g, want (%g, %g), %.12g", c, gx, gy, r, c.x, c.y, c.a*square)
		}
	}
}
