package scene

import (
	"strings"
	"testing"
)

const packBase = `
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
`

// An L of two boxes, 0.1 x 0.02 x 0.02 m along x and 0.02 x 0.02 x 0.08
// m standing at its end, density 1000: the combined centre of mass is the
// mass-weighted mean and the inertia about it the sum of each piece's
// own (m (b^2 + c^2) / 12, any statics text) moved by the parallel-axis
// theorem (Meriam and Kraige, Dynamics, app. B).
func TestCompoundMassByParallelAxis(t *testing.T) {
	s, err := Parse([]byte(packBase+`
[[body]]
name = "ell"
density = 1000
shape = { pieces = [ { box = [0.1, 0.02, 0.02] }, { box = [0.02, 0.02, 0.08], at = [0.04, 0, 0.05] } ] }
position = [0, 0, 1]
`), "ell.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := s.Bodies[1].Props
	m1, m2 := 1000*0.1*0.02*0.02, 1000*0.02*0.02*0.08
	m := m1 + m2
	cx, cz := m2*0.04/m, m2*0.05/m
	// Inertia about y: each box's m (x^2 + z^2) / 12 plus m (dx^2 + dz^2).
	iyy := m1*(0.1*0.1+0.02*0.02)/12 + m1*(cx*cx+cz*cz) +
		m2*(0.02*0.02+0.08*0.08)/12 + m2*((0.04-cx)*(0.04-cx)+(0.05-cz)*(0.05-cz))
	// Product of inertia I_xz = -sum m dx dz (the boxes' own are zero).
	ixz := -(m1*(-cx)*(-cz) + m2*(0.04-cx)*(0.05-cz))
	checks := []struct {
		what      string
		got, want float64
	}{
		{"mass", p.Mass, m}, {"centre x", p.Center[0], cx}, {"centre z", p.Center[2], cz},
		{"I_yy", p.Inertia.At(1, 1), iyy}, {"I_xz", p.Inertia.At(0, 2), ixz},
	}
	for _, c := range checks {
		if !near(c.got, c.want) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
}

// A centre of mass given without an inertia moves the uniform solid's
// inertia to it by the parallel-axis theorem, I + m (|d|^2 E - d d^T)
// (Meriam and Kraige, Dynamics, app. B), from the box's own m (b^2 +
// c^2) / 12 (any statics text's table of inertias).
func TestCentreOfMassMovesTheInertia(t *testing.T) {
	s, err := Parse([]byte(`units = { length = "mm", mass = "kg" }`+packBase+`
[[body]]
name = "carton"
mass = 12
shape = { box = [400, 300, 250] }
center_of_mass = [30, -20, -40]
position = [0, 0, 1000]
`), "c.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := s.Bodies[1].Props
	d := [3]float64{0.03, -0.02, -0.04}
	ixx := 12*(0.3*0.3+0.25*0.25)/12 + 12*(d[1]*d[1]+d[2]*d[2])
	ixy := -12 * d[0] * d[1]
	if !near(p.Inertia.At(0, 0), ixx) || !near(p.Inertia.At(0, 1), ixy) || !near(p.Center[2], -0.04) {
		t.Errorf("inertia %v, centre %v; want I_xx %g, I_xy %g", p.Inertia, p.Center, ixx, ixy)
	}
	// With an inertia given, it is taken as it is (kg mm^2 here).
	s, err = Parse([]byte(`units = { length = "mm", mass = "kg" }`+packBase+`
[[body]]
name = "carton"
mass = 12
shape = { box = [400, 300, 250] }
center_of_mass = [30, -20, -40]
inertia = [[200000, 0, 0], [0, 270000, 0], [0, 0, 300000]]
position = [0, 0, 1000]
`), "c.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Bodies[1].Props.Inertia.At(1, 1); !near(got, 0.27) {
		t.Errorf("I_yy = %g kg m^2, want 0.27", got)
	}
}

func TestPackagingBadInput(t *testing.T) {
	body := `
[[body]]
name = "carton"
mass = 12
shape = { box = [0.4, 0.3, 0.25] }
position = [0, 0, 1]
`
	cases := []struct{ name, text, want string }{
		{"outside", body + "center_of_mass = [0.3, 0, 0]\n", "lies outside the body's shape"},
		{"not symmetric", body + "inertia = [[1, 0.1, 0], [0, 1, 0], [0, 0, 1]]\n", "must be symmetric"},
		{"triangle inequality", body + "inertia = [[0.1, 0, 0], [0, 0.1, 0], [0, 0, 1]]\n", "no rigid body has this inertia"},
		{"negative", body + "inertia = [[-1, 0, 0], [0, 1, 0], [0, 0, 1]]\n", "positive principal moments"},
		{"mass outside", body + "inertia = [[10, 0, 0], [0, 10, 0], [0, 0, 10]]\n", "needs mass outside the body's shape"},
		{"not a matrix", body + "inertia = [1, 2]\n", "3 x 3 matrix"},
		{"static", "\n[[body]]\nname = \"shelf\"\nstatic = true\nshape = { box = [1, 1, 1] }\ncenter_of_mass = [0, 0, 0]\n" + body, "takes no center_of_mass"},
		{"piece plane", "\n[[body]]\nname = \"p\"\nmass = 1\nshape = { pieces = [ { plane = [0, 0, 1] } ] }\n", "a piece must be a box"},
		{"piece key", "\n[[body]]\nname = \"p\"\nmass = 1\nshape = { pieces = [ { box = [1, 1, 1], att = [0, 0, 1] } ] }\n", "unknown key \"att\" in piece 1 of body \"p\"; did you mean \"at\"?"},
		{"nested pieces", "\n[[body]]\nname = \"p\"\nmass = 1\nshape = { pieces = [ { pieces = [] } ] }\n", "cannot itself have pieces"},
		{"empty pieces", "\n[[body]]\nname = \"p\"\nmass = 1\nshape = { pieces = [] }\n", "list of tables"},
		{"bad strike", body + "[drop]\nbody = \"carton\"\nstrike = \"edge 1-3\"\nheight = 0.5\n", "do not meet"},
		{"by what", body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = \"by weight\"\n", "write height = \"by mass\""},
		{"no height", body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\n", "height is missing"},
		{"too heavy", strings.Replace(body, "mass = 12", "mass = 80", 1) + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = \"by mass\"\n", "beyond the drop-height table"},
		{"static dropped", body + "[drop]\nbody = \"floor\"\nstrike = \"face 3\"\nheight = 0.5\n", "only a body moved by gravity"},
		{"spinning", body + "spin = [0, 0, 1]\n[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = 0.5\n", "a drop starts at rest"},
		{"random spin", body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = 0.5\n[sweep]\n[sweep.randomize]\nspin = { carton = 2 }\n", "a drop starts at rest"},
		{"random height", body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = 0.5\n[sweep]\n[sweep.randomize]\nposition = { carton = [0.01, 0.01, 0.01] }\n", "change the drop height"},
		{"ten without drop", body + "[sweep]\ndrops = \"ten\"\n", "needs a [drop] section"},
		{"unknown sequence", body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = 0.5\n[sweep]\ndrops = \"six\"\n", "must be \"ten\""},
		{"two planes", "\n[[body]]\nname = \"wall\"\nshape = { plane = [1, 0, 0] }\n" + body + "[drop]\nbody = \"carton\"\nstrike = \"face 3\"\nheight = 0.5\n", "more than one static plane"},
	}
	for _, c := range cases {
		_, err := Parse([]byte(packBase+c.text), "bad.toml", Options{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want an error with %q", c.name, err, c.want)
		}
	}
}

// The ten-drop study's case n is drop n of the sequence.
func TestTenDropsVaryTheStrike(t *testing.T) {
	s, err := Parse([]byte(packBase+`
[[body]]
name = "carton"
mass = 12
shape = { box = [0.4, 0.3, 0.25] }
[drop]
body = "carton"
strike = "face 3"
height = "by mass"
[sweep]
drops = "ten"
`), "ten.toml", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Sweep.Vary) != 1 || s.Sweep.Vary[0].Key != DropNumberKey || s.Sweep.Cases() != 10 {
		t.Fatalf("vary %+v", s.Sweep.Vary)
	}
	want := []string{"corner 2-3-5", "edge 2-5", "edge 3-5", "edge 2-3", "face 5", "face 6", "face 2", "face 4", "face 1", "face 3"}
	for n, w := range want {
		c, err := s.With(DropNumberKey, float64(n+1))
		if err != nil {
			t.Fatal(err)
		}
		if got := c.Drop.Strike.String(); got != w || !near(c.Drop.Height, 0.61) {
			t.Errorf("drop %d: %s from %g m, want %s from 0.61 m", n+1, got, c.Drop.Height, w)
		}
	}
}

// TestInertiaErrorsInSceneUnits checks that a refused inertia is quoted in
// the scene's units, as the user wrote it (kg mm2 here), not in SI.
func TestInertiaErrorsInSceneUnits(t *testing.T) {
	body := `units = { length = "mm", mass = "kg" }
[[body]]
name = "carton"
mass = 12
shape = { box = [400, 300, 250] }
position = [0, 0, 1000]
`
	cases := []struct{ name, text, want string }{
		{"not symmetric", "inertia = [[200000, 10, 0], [0, 270000, 0], [0, 0, 300000]]\n", "row 1 column 2 is 10 kg mm2"},
		{"negative", "inertia = [[-1, 0, 0], [0, 1, 0], [0, 0, 1]]\n", "got -1, 1 and 1 kg mm2"},
		{"triangle inequality", "inertia = [[100000, 0, 0], [0, 100000, 0], [0, 0, 300000]]\n", "300000 kg mm2 exceeds the sum of the other two (100000 + 100000)"},
	}
	for _, c := range cases {
		_, err := Parse([]byte(body+c.text), "bad.toml", Options{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want an error with %q", c.name, err, c.want)
		}
	}
}
