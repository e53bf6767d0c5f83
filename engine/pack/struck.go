package pack

import (
	"math"

	"clatter/shapes"
)

// featureTol is the fraction of the box's diagonal within which corners
// count as equally far along the contact normal, and a contact point as
// on a face of the box: about half a degree of tilt across the box, so
// that a flat face drop is a face drop although the solver leaves the body
// turned by a hair, while a drop tilted by a few degrees is an edge drop.
const featureTol = 0.01

// Struck returns the feature of a body's box of bounds b that an impact
// struck: point is the contact point and toward the direction from the
// body to what it struck (the contact normal), both in the body's axes.
// The corners of the box farthest along toward give the feature (one
// corner, the edge of two, the face of four); where the contact point lies
// on some faces of the box, the feature is cut to them (a box struck flat
// on an edge reports its contact at one end of it). It returns nil when
// neither tells (a part struck inside a groove).
func Struck(b shapes.AABB, point, toward shapes.Vec3) Feature {
	tol := featureTol * b.Size().Len()
	byNormal := lowestFaces(b, toward, tol)
	var onFaces Feature
	for f := Face(1); f <= 6; f++ {
		a := axisOf[f]
		plane := b.Min[a.axis]
		if a.sign > 0 {
			plane = b.Max[a.axis]
		}
		if math.Abs(point[a.axis]-plane) <= tol {
			onFaces = append(onFaces, f)
		}
	}
	if len(onFaces) == 0 {
		return byNormal
	}
	if both := intersect(byNormal, onFaces); len(both) > 0 {
		return both
	}
	return sorted(onFaces)
}

// lowestFaces returns the faces shared by every corner of the box within
// tol of the farthest along d.
func lowestFaces(b shapes.AABB, d shapes.Vec3, tol float64) Feature {
	if !(d.Len() > 0) {
		return nil
	}
	d = d.Normalize()
	var reach [8]float64
	best := math.Inf(-1)
	for k := range reach {
		reach[k] = corner(b, k).Dot(d)
		best = math.Max(best, reach[k])
	}
	shared := Feature{1, 2, 3, 4, 5, 6}
	for k := range reach {
		if reach[k] >= best-tol {
			shared = intersect(shared, cornerFaces(k))
		}
	}
	if len(shared) > 3 {
		return nil
	}
	return shared
}

// corner k of the box: bit a set takes Max along axis a.
func corner(b shapes.AABB, k int) shapes.Vec3 {
	c := b.Min
	for a := 0; a < 3; a++ {
		if k&(1<<a) != 0 {
			c[a] = b.Max[a]
		}
	}
	return c
}

// cornerFaces lists the three faces that meet at corner k, sorted.
func cornerFaces(k int) Feature {
	ft := Feature{5, 2, 3} // -x, -y, -z
	if k&1 != 0 {
		ft[0] = 6
	}
	if k&2 != 0 {
		ft[1] = 4
	}
	if k&4 != 0 {
		ft[2] = 1
	}
	return sorted(ft)
}

func intersect(a, b Feature) Feature {
	var out Feature
	for _, x := range a {
		for _, y := range b {
			if x == y {
				out = append(out, x)
			}
		}
	}
	return out
}

func sorted(ft Feature) Feature {
	out := append(Feature{}, ft...)
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j] < out[j-1]; j-- {
			out[j], out[j-1] = out[j-1], out[j]
		}
	}
	return out
}

// FaceDown returns the face whose outward normal is within tolDeg degrees
// of down (both in the body's axes), or 0 when none is: the face a body
// rests on, in package numbering.
func FaceDown(down shapes.Vec3, tolDeg float64) Face {
	down = down.Normalize()
	for f := Face(1); f <= 6; f++ {
		if f.Normal().Dot(down) >= math.Cos(tolDeg*math.Pi/180) {
			return f
		}
	}
	return 0
}
