package scene

import (
	"fmt"
	"math"
	"strconv"

	"clatter/shapes"
)

// MomentOfInertia is mass times length squared.
var MomentOfInertia = Dim{L: 2, M: 1}

// measured applies a body's center_of_mass and inertia keys to b.Props:
// mass properties as CAD reports them for a packed product, in the
// shape's axes. A centre of mass without an inertia moves the uniform
// solid's inertia to it by the parallel-axis theorem.
func (r *reader) measured(sec section, comv Vector, inv value, b *Body) {
	com, hasCOM := r.vec3(sec, comv, Length, shapes.Vec3{})
	if comv.Given() && !hasCOM {
		return
	}
	if hasCOM {
		if !inside(b.Shape, com) {
			r.errAt(comv.path, "%scenter_of_mass %v %s lies outside the body's shape; give it in the shape's own axes, from the shape's origin (a box's centre, a mesh file's origin)", sec.pre, r.s.Units.VecFromSI(com, Length), r.s.Units.Length)
			return
		}
		d := com.Sub(b.Props.Center)
		b.Props.Inertia = shapes.ParallelAxis(b.Props.Inertia, b.Props.Mass, d)
		b.Props.Center = com
	}
	if !inv.Given() {
		return
	}
	in, ok := r.inertia(inv, sec.pre)
	if ok && r.plausible(inv.path, sec.pre, b, in) {
		b.Props.Inertia = in
	}
}

// plausible checks an inertia against the body's size: no principal
// moment can exceed m R^2, R the farthest reach of the shape's box of
// bounds from the centre of mass (all the mass there); one below a
// hundredth of the uniform solid's is allowed but most likely a slip of
// units, and warned of.
func (r *reader) plausible(path []string, pre string, b *Body, in shapes.Mat3) bool {
	mom, _, err := shapes.Principal(in)
	if err != nil {
		return false
	}
	bounds := b.Shape.Bounds()
	reach := 0.0
	for k := 0; k < 8; k++ {
		c := bounds.Min
		for a := 0; a < 3; a++ {
			if k&(1<<a) != 0 {
				c[a] = bounds.Max[a]
			}
		}
		reach = math.Max(reach, c.Sub(b.Props.Center).Len())
	}
	u := r.s.Units
	unit := fmt.Sprintf("%s %s2", u.Mass, u.Length)
	if limit := b.Props.Mass * reach * reach; mom[2] > limit*(1+1e-9) {
		r.errAt(path, "%sinertia: a principal moment of %.6g %s needs mass outside the body's shape (at most m R^2 = %.6g %s with all of it at the farthest corner); inertia is in the scene's units, mass x length^2", pre, u.FromSI(mom[2], MomentOfInertia), unit, u.FromSI(limit, MomentOfInertia), unit)
		return false
	}
	solid, _, err := shapes.Principal(b.Props.Inertia)
	if err == nil && mom[0] < 0.01*solid[0] {
		r.warnAt(path, "%sinertia: its smallest principal moment %.6g %s is under a hundredth of the uniform solid's %.6g %s; inertia is in the scene's units (%s)", pre, u.FromSI(mom[0], MomentOfInertia), unit, u.FromSI(solid[0], MomentOfInertia), unit, unit)
	}
	return true
}

// inertia reads a 3 x 3 inertia tensor by rows, mass x length^2, and
// checks that a rigid body can have it: symmetric, positive moments that
// satisfy the triangle inequality (each principal moment at most the sum
// of the other two, since I_x + I_y - I_z = 2 sum m z^2 >= 0).
func (r *reader) inertia(inv value, pre string) (shapes.Mat3, bool) {
	path := inv.path
	rows, ok := inv.v.([]any)
	const how = "inertia must be a 3 x 3 matrix by rows, e.g. [[0.25, 0, 0], [0, 0.31, 0], [0, 0, 0.33]] (mass x length^2 about the centre of mass, shape axes)"
	if !ok || len(rows) != 3 {
		r.errAt(path, "%s%s", pre, how)
		return shapes.Mat3{}, false
	}
	var m shapes.Mat3
	for i, row := range rows {
		x, ok := r.vec(row, MomentOfInertia, sub(path, strconv.Itoa(i)), fmt.Sprintf("%sinertia row %d", pre, i+1), 3)
		if !ok {
			return m, false
		}
		for c := 0; c < 3; c++ {
			m.Set(i, c, x[c])
		}
	}
	// Messages give values in the scene's units, as the user wrote them.
	u := r.s.Units
	unit := fmt.Sprintf("%s %s2", u.Mass, u.Length)
	in := func(x float64) float64 { return u.FromSI(x, MomentOfInertia) }
	scale := math.Max(math.Abs(m.At(0, 0)), math.Max(math.Abs(m.At(1, 1)), math.Abs(m.At(2, 2))))
	for i := 0; i < 3; i++ {
		for j := i + 1; j < 3; j++ {
			if math.Abs(m.At(i, j)-m.At(j, i)) > 1e-9*scale {
				r.errAt(path, "%sinertia must be symmetric: row %d column %d is %.6g %s but row %d column %d is %.6g %s", pre, i+1, j+1, in(m.At(i, j)), unit, j+1, i+1, in(m.At(j, i)), unit)
				return m, false
			}
		}
	}
	mom, _, err := shapes.Principal(m)
	if err != nil || !(mom[0] > 0) {
		r.errAt(path, "%sinertia must have positive principal moments, got %.6g, %.6g and %.6g %s; check the signs of the products of inertia (CAD tools differ in them)", pre, in(mom[0]), in(mom[1]), in(mom[2]), unit)
		return m, false
	}
	if mom[2] > (mom[0]+mom[1])*(1+1e-9) {
		r.errAt(path, "%sno rigid body has this inertia: its largest principal moment %.6g %s exceeds the sum of the other two (%.6g + %.6g); check the units (mass x length^2 in the scene's units) and the signs of the products", pre, in(mom[2]), unit, in(mom[0]), in(mom[1]))
		return m, false
	}
	return m, true
}

// at returns the raw value at a path of the document.
func (r *reader) at(path []string) any {
	var cur any = r.s.raw
	for _, k := range path {
		switch t := cur.(type) {
		case map[string]any:
			cur = t[k]
		case []map[string]any:
			i, _ := strconv.Atoi(k)
			cur = t[i]
		case []any:
			i, _ := strconv.Atoi(k)
			cur = t[i]
		default:
			return nil
		}
	}
	return cur
}

// inside reports whether p lies in the shape: for a convex shape, on the
// inner side of its supporting plane in every direction of a fine set (the
// axes, the diagonals and between); for a compound, in one of its pieces.
func inside(s shapes.Shape, p shapes.Vec3) bool {
	switch c := s.(type) {
	case *shapes.Compound:
		for _, pc := range c.Pieces {
			if inside(pc.Shape, pc.Pose.ApplyInv(p)) {
				return true
			}
		}
		return false
	case shapes.Convex:
		tol := 1e-9 * c.Bounds().Size().Len()
		for x := -2; x <= 2; x++ {
			for y := -2; y <= 2; y++ {
				for z := -2; z <= 2; z++ {
					d := shapes.Vec3{float64(x), float64(y), float64(z)}
					if x == 0 && y == 0 && z == 0 {
						continue
					}
					if d.Dot(p) > d.Dot(c.Support(d))+tol*d.Len() {
						return false
					}
				}
			}
		}
		return true
	}
	return true
}
