package shapes

import (
	"math"
	"testing"

	"github.com/go-gl/mathgl/mgl64"
)

// massRelTol: closed-form primitives against closed-form handbook values,
// so only rounding separates them.
const massRelTol = 1e-12

func diagOf(m Mat3) Vec3 { return Vec3{m.At(0, 0), m.At(1, 1), m.At(2, 2)} }

func TestPrimitiveMass(t *testing.T) {
	const rho = 1200.0
	r, h := 0.01, 0.04
	// Handbook values (any dynamics or strength-of-materials handbook).
	cyl := math.Pi * r * r * h * rho
	sph := 4.0 / 3 * math.Pi * r * r * r * rho
	cases := []struct {
		name    string
		shape   Convex
		mass    float64
		inertia Vec3
	}{
		{"box", Box{Half: Vec3{0.05, 0.03, 0.02}}, 0.1 * 0.06 * 0.04 * rho,
			Vec3{(0.06*0.06 + 0.04*0.04) / 12, (0.1*0.1 + 0.04*0.04) / 12, (0.1*0.1 + 0.06*0.06) / 12}.Mul(0.1 * 0.06 * 0.04 * rho)},
		{"sphere", Sphere{Radius: r}, sph, Vec3{0.4, 0.4, 0.4}.Mul(sph * r * r)},
		{"cylinder", Cylinder{Radius: r, HalfLength: h / 2}, cyl,
			Vec3{cyl * (3*r*r + h*h) / 12, cyl * (3*r*r + h*h) / 12, cyl * r * r / 2}},
		// Capsule: cylinder plus two hemispheres, each at 3r/8 from its flat
		// face, moved by the parallel-axis theorem.
		{"capsule", Capsule{Radius: r, HalfLength: h / 2}, cyl + sph, func() Vec3 {
			hemi := sph / 2
			ic := 83.0 / 320 * hemi * r * r // hemisphere about its own centre of mass, transverse
			dz := h/2 + 3*r/8
			ix := cyl*(3*r*r+h*h)/12 + 2*(ic+hemi*dz*dz)
			return Vec3{ix, ix, cyl*r*r/2 + sph*2*r*r/5}
		}()},
	}
	for _, c := range cases {
		m := c.shape.Mass(rho)
		if math.Abs(m.Mass-c.mass) > massRelTol*c.mass {
			t.Errorf("%s: mass %g, want %g", c.name, m.Mass, c.mass)
		}
		got := diagOf(m.Inertia)
		for k := 0; k < 3; k++ {
			if math.Abs(got[k]-c.inertia[k]) > 1e-9*c.inertia[k] {
				t.Errorf("%s: inertia %v, want %v", c.name, got, c.inertia)
				break
			}
		}
	}
}

func TestCompoundParallelAxis(t *testing.T) {
	// Two equal cubes side by side are one 2:1:1 box: m(b^2+c^2)/12 of the
	// whole (handbook box formula; parallel-axis theorem for the parts).
	a := 0.01
	c := &Compound{Pieces: []Piece{
		{Shape: Box{Half: Vec3{a, a, a}}, Pose: Pose{Position: Vec3{-a, 0, 0}, Orientation: mgl64.QuatIdent()}},
		{Shape: Box{Half: Vec3{a, a, a}}, Pose: Pose{Position: Vec3{a, 0, 0}, Orientation: mgl64.QuatRotate(0.3, Vec3{1, 0, 0})}},
	}}
	m := c.Mass(1000)
	want := Box{Half: Vec3{2 * a, a, a}}.Mass(1000)
	if math.Abs(m.Mass-want.Mass) > massRelTol*want.Mass || m.Center.Len() > 1e-15 {
		t.Fatalf("mass %g at %v, want %g at 0", m.Mass, m.Center, want.Mass)
	}
	for k := 0; k < 9; k++ {
		if math.Abs(m.Inertia[k]-want.Inertia[k]) > 1e-9*want.Inertia[0] {
			t.Fatalf("inertia %v, want %v", m.Inertia, want.Inertia)
		}
	}
}

func TestPrincipal(t *testing.T) {
	// A box's inertia turned by a rotation has the box's moments as
	// eigenvalues and the turned axes as eigenvectors (cross-checked through
	// gonum's EigenSym against R D R^T).
	b := Box{Half: Vec3{0.03, 0.02, 0.01}}.Mass(1000)
	q := mgl64.QuatRotate(0.7, Vec3{1, 2, 3}.Normalize())
	moments, axes, err := Principal(RotatedInertia(b.Inertia, q))
	if err != nil {
		t.Fatal(err)
	}
	want := diagOf(b.Inertia) // ascending: z is smallest? order them
	ws := []float64{want[0], want[1], want[2]}
	for i := 0; i < 3; i++ {
		for j := i + 1; j < 3; j++ {
			if ws[j] < ws[i] {
				ws[i], ws[j] = ws[j], ws[i]
			}
		}
	}
	for k := 0; k < 3; k++ {
		if math.Abs(moments[k]-ws[k]) > 1e-9*ws[2] {
			t.Fatalf("moments %v, want %v", moments, ws)
		}
	}
	if d := axes.Det(); math.Abs(d-1) > 1e-12 {
		t.Fatalf("axes not a rotation: det %g", d)
	}
	// Each axis is an eigenvector: I a = lambda a.
	in := RotatedInertia(b.Inertia, q)
	for k := 0; k < 3; k++ {
		a := axes.Col(k)
		if r := in.Mul3x1(a).Sub(a.Mul(moments[k])).Len(); r > 1e-9*ws[2] {
			t.Fatalf("axis %d residual %g", k, r)
		}
	}
}

func TestRotationMatrix(t *testing.T) {
	q := mgl64.QuatRotate(1.1, Vec3{0.3, -0.5, 0.8}.Normalize())
	r := RotationMatrix(q)
	v := Vec3{0.2, -1.3, 0.7}
	if d := r.Mul3x1(v).Sub(q.Rotate(v)).Len(); d > 1e-14 {
		t.Fatalf("matrix and quaternion rotations differ by %g", d)
	}
}
