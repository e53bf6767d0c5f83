package shapes

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Mass holds the mass properties of a uniform solid in its shape's frame.
type Mass struct {
	Volume float64
	Mass   float64
	// Center is the centre of mass in the shape's local frame.
	Center Vec3
	// Inertia is the inertia tensor about the centre of mass, in the shape's axes.
	Inertia Mat3
}

// Scaled returns the same solid at another density.
func (m Mass) Scaled(density float64) Mass {
	f := density * m.Volume
	if m.Mass != 0 {
		f /= m.Mass
	}
	return Mass{Volume: m.Volume, Mass: density * m.Volume, Center: m.Center, Inertia: m.Inertia.Mul(f)}
}

// WithMass returns the same solid scaled to total mass mass (density adjusted).
func (m Mass) WithMass(mass float64) Mass {
	if m.Volume == 0 {
		return m
	}
	return m.Scaled(mass / m.Volume)
}

// diagInertia builds a diagonal inertia tensor.
func diagInertia(ix, iy, iz float64) Mat3 { return Mat3{ix, 0, 0, 0, iy, 0, 0, 0, iz} }

// ParallelAxis returns the inertia about a point offset by d from the centre
// of mass: I + m (|d|^2 E - d d^T) (the parallel-axis theorem).
func ParallelAxis(inertia Mat3, mass float64, d Vec3) Mat3 {
	dd := d.Dot(d)
	var out Mat3
	for c := 0; c < 3; c++ {
		for r := 0; r < 3; r++ {
			v := -d[r] * d[c]
			if r == c {
				v += dd
			}
			out[c*3+r] = inertia[c*3+r] + mass*v
		}
	}
	return out
}

// Rotated returns R I R^T: the inertia tensor expressed in axes turned by q.
func RotatedInertia(inertia Mat3, q Quat) Mat3 {
	r := RotationMatrix(q)
	return r.Mul3(inertia).Mul3(r.Transpose())
}

// Combine returns the mass properties of the union of solids already
// expressed in one frame (compound parts; the parallel-axis theorem).
func Combine(parts ...Mass) Mass {
	var out Mass
	var moment Vec3
	for _, p := range parts {
		out.Volume += p.Volume
		out.Mass += p.Mass
		moment = moment.Add(p.Center.Mul(p.Mass))
	}
	if out.Mass > 0 {
		out.Center = moment.Mul(1 / out.Mass)
	}
	for _, p := range parts {
		out.Inertia = out.Inertia.Add(ParallelAxis(p.Inertia, p.Mass, p.Center.Sub(out.Center)))
	}
	return out
}

// Principal returns the principal moments (ascending) and the principal axes
// (as matrix columns, a right-handed frame) of a symmetric inertia tensor,
// from gonum's symmetric eigen-decomposition.
func Principal(inertia Mat3) (moments Vec3, axes Mat3, err error) {
	s := mat.NewSymDense(3, nil)
	for r := 0; r < 3; r++ {
		for c := r; c < 3; c++ {
			s.SetSym(r, c, 0.5*(inertia.At(r, c)+inertia.At(c, r)))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(s, true) {
		return moments, axes, errors.New("shapes: eigen-decomposition of the inertia tensor failed")
	}
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	for c := 0; c < 3; c++ {
		moments[c] = vals[c]
		for r := 0; r < 3; r++ {
			axes[c*3+r] = vecs.At(r, c)
		}
	}
	if axes.Det() < 0 {
		for r := 0; r < 3; r++ {
			axes[2*3+r] = -axes[2*3+r]
		}
	}
	return moments, axes, nil
}

// PolyhedronMass computes the mass properties of the solid bounded by a
// closed, consistently outward-oriented triangle mesh, by the divergence
// theorem applied to polynomial integrals over each triangle: D. Eberly,
// "Polyhedral Mass Properties (Revisited)", Geometric Tools, 2002, after
// B. Mirtich, "Fast and accurate computation of polyhedral mass properties",
// J. Graphics Tools 1(2), 1996.
//
// The integrals are taken about an origin shifted to a vertex of the mesh, so
// that parts far from their file origin keep full precision.
func PolyhedronMass(verts []Vec3, tris [][3]int32, density float64) (Mass, error) {
	if len(tris) == 0 || len(verts) == 0 {
		return Mass{}, errors.New("shapes: empty mesh has no mass")
	}
	o := verts[tris[0][0]]
	intg, err := polyhedronIntegrals(verts, tris, o)
	if err != nil {
		return Mass{}, err
	}
	vol := intg[0]
	if !(vol > 0) || math.IsInf(vol, 0) {
		return Mass{}, fmt.Errorf("shapes: mesh encloses no positive volume (%g); is it closed and outward-facing?", vol)
	}
	c := Vec3{intg[1] / vol, intg[2] / vol, intg[3] / vol}
	// Second moments about the shifted origin, then about the centre of mass.
	xx := intg[5] + intg[6] - vol*(c[1]*c[1]+c[2]*c[2])
	yy := intg[4] + intg[6] - vol*(c[2]*c[2]+c[0]*c[0])
	zz := intg[4] + intg[5] - vol*(c[0]*c[0]+c[1]*c[1])
	xy := -(intg[7] - vol*c[0]*c[1])
	yz := -(intg[8] - vol*c[1]*c[2])
	xz := -(intg[9] - vol*c[2]*c[0])
	in := Mat3{xx, xy, xz, xy, yy, yz, xz, yz, zz}.Mul(density)
	return Mass{Volume: vol, Mass: density * vol, Center: c.Add(o), Inertia: in}, nil
}

// polyhedronIntegrals returns the integrals over the solid of 1, x, y, z,
// x2, y2, z2, xy, yz and zx, about the origin o, summed over the triangles.
func polyhedronIntegrals(verts []Vec3, tris [][3]int32, o Vec3) ([10]float64, error) {
	const (
		m1 = 1.0 / 6
		m2 = 1.0 / 24
		m3 = 1.0 / 60
		m4 = 1.0 / 120
	)
	var intg [10]float64 // 1, x, y, z, x2, y2, z2, xy, yz, zx
	nv := len(verts)
	for _, t := range tris {
		if int(t[0]) >= nv || int(t[1]) >= nv || int(t[2]) >= nv || t[0] < 0 || t[1] < 0 || t[2] < 0 {
			return intg, fmt.Errorf("shapes: triangle %v indexes past the %d vertices", t, nv)
		}
		v0, v1, v2 := &verts[t[0]], &verts[t[1]], &verts[t[2]]
		x0, y0, z0 := v0[0]-o[0], v0[1]-o[1], v0[2]-o[2]
		x1, y1, z1 := v1[0]-o[0], v1[1]-o[1], v1[2]-o[2]
		x2, y2, z2 := v2[0]-o[0], v2[1]-o[1], v2[2]-o[2]
		// Edge cross product: the (unnormalised) outward normal.
		ax, ay, az := x1-x0, y1-y0, z1-z0
		bx, by, bz := x2-x0, y2-y0, z2-z0
		dx, dy, dz := ay*bz-az*by, az*bx-ax*bz, ax*by-ay*bx
		f1x, f2x, f3x, g0x, g1x, g2x := eberlyTerms(x0, x1, x2)
		_, f2y, f3y, g0y, g1y, g2y := eberlyTerms(y0, y1, y2)
		_, f2z, f3z, g0z, g1z, g2z := eberlyTerms(z0, z1, z2)
		intg[0] += dx * f1x
		intg[1] += dx * f2x
		intg[2] += dy * f2y
		intg[3] += dz * f2z
		intg[4] += dx * f3x
		intg[5] += dy * f3y
		intg[6] += dz * f3z
		intg[7] += dx * (y0*g0x + y1*g1x + y2*g2x)
		intg[8] += dy * (z0*g0y + z1*g1y + z2*g2y)
		intg[9] += dz * (x0*g0z + x1*g1z + x2*g2z)
	}
	intg[0] *= m1
	intg[1] *= m2
	intg[2] *= m2
	intg[3] *= m2
	intg[4] *= m3
	intg[5] *= m3
	intg[6] *= m3
	intg[7] *= m4
	intg[8] *= m4
	intg[9] *= m4
	return intg, nil
}

// eberlyTerms are Eberly's subexpressions of one coordinate w of a
// triangle's three vertices.
func eberlyTerms(w0, w1, w2 float64) (f1, f2, f3, g0, g1, g2 float64) {
	t0 := w0 + w1
	f1 = t0 + w2
	t1 := w0 * w0
	t2 := t1 + w1*t0
	f2 = t2 + w2*f1
	f3 = w0*t1 + w1*t2 + w2*f2
	g0, g1, g2 = f2+w0*(f1+w0), f2+w1*(f1+w1), f2+w2*(f1+w2)
	return f1, f2, f3, g0, g1, g2
}
