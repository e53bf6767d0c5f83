package scene

import (
	"errors"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	"clatter/engine"
)

func newTestRand() *rand.Rand { return rand.New(rand.NewPCG(1, 2)) }

// fuzzSteps is how many steps of an accepted scene the fuzzer takes: enough
// for first contacts, impacts and drives to act, few enough that each input
// takes milliseconds.
const fuzzSteps = 40

// FuzzScene checks that the scene reader never panics and never lets
// through a scene that breaks the world: whatever the bytes, Parse returns
// a scene or an error with a message; a scene it accepts builds (or says
// why not), and steps without a panic, stopping at most with an error that
// names a body.
func FuzzScene(f *testing.F) {
	files, _ := filepath.Glob("../../testdata/scenes/*.toml")
	mechs, _ := filepath.Glob("../../testdata/mechanisms/*.toml")
	files = append(files, mechs...)
	packs, _ := filepath.Glob("../../testdata/packaging/*.toml")
	files = append(files, packs...)
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	for _, s := range []string{
		"", "[world]\nstep = 1e-300\n", "units = { length = \"in\" }\n[[body]]\nname = \"a\"\nshape = { sphere = \"1 ft\" }\nmass = \"1 lb\"\n",
		"[[body]]\nname = \"a\"\nshape = { mesh = \"parts/cube.stl\" }\nmass = 1\norientation = \"random\"\n",
		"[[body]]\nname=\"x\"\nshape={capsule=[1,0]}\ndensity=1\n[sweep]\n[[sweep.vary]]\nkey=\"body.x.shape.capsule.1\"\nvalues=[1,2]\n",
		"a = \"\"\"\nb = 1\n\"\"\"\n[[x]]\n[[x.y]]\n[x.y.z]\n",
		mechBase + "[[drive]]\nbody = \"table\"\npath = \"poses.csv\"\nrepeat = true\n[[joint]]\nname = \"r\"\nkind = \"link\"\nbodies = [\"flap\", \"table\"]\nat = [0, 0, 0]\nat_other = [0, 0, 1]\nlength = [1, 2]\n",
	} {
		f.Add([]byte(s))
	}
	// Hostile inputs: nesting, overflowing numbers and units.
	for _, s := range []string{
		"a = " + strings.Repeat("[", 40) + strings.Repeat("]", 40),
		"a = " + strings.Repeat("{b = ", 40) + "1" + strings.Repeat("}", 40),
		hostile("AXIS", "[1e300, 1e300, 0]"), hostile("PLANE", "[0, 0, 1e300]"), hostile("FRICTION", "1e308"),
		hostile("DENSITY", `"10`+strings.Repeat(" m9", 28)+` m4"`), hostile("BOX", "[1e308, 0.02, 0.02]"), hostile(),
	} {
		f.Add([]byte(s))
	}
	stl, err := os.ReadFile("../../testdata/parts/cube.stl")
	if err != nil {
		f.Fatal(err)
	}
	fsys := fstest.MapFS{"parts/cube.stl": {Data: stl}, "parts/bracket.stl": {Data: stl}, "../parts/bracket.stl": {Data: stl},
		"poses.csv": {Data: []byte("time,x,y,z,qw,qx,qy,qz\n0,0,0,0,1,0,0,0\n1,1,0,0,0,0,0,1\n2,0,0,0,1,0,0,0\n")}}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Parse(data, "fuzz.toml", Options{Dir: ".", FS: fsys})
		if err != nil {
			if err.Error() == "" {
				t.Error("an error without a message")
			}
			return
		}
		w, _, err := s.Build()
		if err != nil {
			t.Logf("accepted but did not build: %v", err)
			return
		}
		dt := s.World.Step
		for i := 0; i < fuzzSteps && float64(i)*dt < s.World.Duration; i++ {
			if err := w.Step(dt); err != nil {
				var de *engine.DivergenceError
				if errors.As(err, &de) && de.Name == "" || err.Error() == "" {
					t.Errorf("a step stopped with %q, which names no body", err)
				}
				return
			}
		}
	})
}
