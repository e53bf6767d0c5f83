package scene

import (
	"strings"
	"testing"
	"testing/fstest"
)

const stiffScene = `[world]
duration = 0.1
step = 0.001
[material.foam]
friction = 0.6
restitution = 0.3
stiffness = %s
[material.steel]
friction = 0.3
restitution = 0.9
stiffness = { modulus = "210 GPa", poisson = 0.3 }
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
material = "foam"
[[body]]
name = "load"
shape = { box = [0.1, 0.1, 0.1] }
density = 1000
position = [0, 0, 0.2]
`

// TestStiffnessKey reads both forms of the key in SI (N/mm is 1000 N/m,
// GPa 1e9 Pa: SI prefixes, exact factors).
func TestStiffnessKey(t *testing.T) {
	for _, c := range []struct {
		src  string
		want float64
	}{{`"40 N/mm"`, 40e3}, {`"2.5 N/mm"`, 2500}, {`40000`, 40e3}} {
		s, err := Parse([]byte(strings.Replace(stiffScene, "%s", c.src, 1)), "s.toml", Options{FS: fstest.MapFS{}})
		if err != nil {
			t.Fatal(err)
		}
		foam := s.Materials[s.MaterialIndex("foam")].Stiffness
		steel := s.Materials[s.MaterialIndex("steel")].Stiffness
		if !near(foam.Linear, c.want) || !near(steel.Modulus, 210e9) || !near(steel.Poisson, 0.3) {
			t.Errorf("%s: foam %+v, steel %+v", c.src, foam, steel)
		}
		if _, _, err := s.Build(); err != nil {
			t.Errorf("%s: %v", c.src, err)
		}
	}
}

// TestStiffnessBadInput: every wrong stiffness is refused with its line
// and what to write instead.
func TestStiffnessBadInput(t *testing.T) {
	for _, c := range []struct{ value, want string }{
		{`"40 N"`, `s.toml:7: material "foam": stiffness must be a stiffness`},
		{`"-5 N/mm"`, `stiffness must be > 0`},
		{`{ modulus = "2 GPa" }`, `needs both modulus and poisson`},
		{`{ modulus = "2 GPa", poisson = 0.7 }`, `poisson must be between -1 and 0.5`},
		{`{ modulus = "2 N/mm", poisson = 0.3 }`, `modulus must be a modulus`},
		{`{ modulus = "2 GPa", poisson = 0.3, shear = 1 }`, `shear`},
	} {
		msg := parseErr(t, strings.Replace(stiffScene, "%s", c.value, 1))
		if !strings.Contains(msg, c.want) {
			t.Errorf("%s: error %q lacks %q", c.value, msg, c.want)
		}
	}
}

// TestStiffnessConflict: a linear cushion meeting a Hertz solid is refused
// at build, naming the body and the [[pair]] to add; with the pair it builds.
func TestStiffnessConflict(t *testing.T) {
	src := strings.Replace(stiffScene, "%s", `"40 N/mm"`, 1) + `material = "steel"
`
	s, err := Parse([]byte(src), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = s.Build()
	if err == nil || !strings.Contains(err.Error(), `s.toml:16: body "load"`) || !strings.Contains(err.Error(), "[[pair]]") {
		t.Fatalf("got %v, want a refusal naming body load and a [[pair]]", err)
	}
	s, err = Parse([]byte(src+`[[pair]]
materials = ["foam", "steel"]
stiffness = "20 N/mm"
`), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := s.Build(); err != nil {
		t.Error(err)
	}
}

// TestHertzNeedsRoundBody: a box on a plate whose material has a modulus
// would be Hertz contact without a round surface; refused at build.
func TestHertzNeedsRoundBody(t *testing.T) {
	src := strings.Replace(strings.Replace(stiffScene, "%s", `"40 N/mm"`, 1), `material = "foam"`, `material = "steel"`, 1)
	s, err := Parse([]byte(src), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := s.Build(); err == nil || !strings.Contains(err.Error(), `s.toml:16: body "load"`) || !strings.Contains(err.Error(), "sphere or a capsule") {
		t.Fatalf("got %v, want a refusal naming body load and round bodies", err)
	}
	s, err = Parse([]byte(strings.Replace(src, "box = [0.1, 0.1, 0.1]", "sphere = 0.05", 1)), "s.toml", Options{FS: fstest.MapFS{}})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := s.Build(); err != nil {
		t.Error(err)
	}
}
