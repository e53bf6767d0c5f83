package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// floor and part are the lines most bad scenes share; the line numbers in
// the expected messages count them.
const floor = `[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
`

const part = `[[body]]
name = "cap"
shape = { box = [10, 10, 10] }
density = "1.05 g/cm3"
position = [0, 0, 5]
`

// mm is a units line for scenes in millimetres.
const mm = `units = { length = "mm", mass = "g" }
`

func TestBadInput(t *testing.T) {
	broken := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join("../../testdata/broken", name))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	cube, err := os.ReadFile("../../testdata/parts/cube.stl")
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name  string
		scene string            // scene.toml, if any
		files map[string][]byte // other files beside it
		args  []string          // default: run scene.toml
		want  string
	}{
		// The header left open is on line 1, where the parser stops.
		{name: "toml syntax", scene: "[world\nstep = 1\n", want: "scene.toml:1: not valid TOML: expected ']' to close table name"},
		{name: "misspelt material key", scene: mm + "[material.abs]\nfricton = 0.3\n" + floor + part,
			want: `scene.toml:3: unknown key "fricton" in [material.abs]; did you mean "friction"?`},
		{name: "misspelt table", scene: "[[bodies]]\nname = \"x\"\n", want: `unknown key "bodies" in the scene's top level; did you mean "body"?`},
		{name: "gate without normal", scene: mm + floor + part + "[[gate]]\nname = \"out\"\nat = [0, 0, 0]\n",
			want: `gate "out": normal is missing`},
		{name: "misspelt world key", scene: "[world]\nstpe = 0.001\n" + floor + part, want: `scene.toml:2: unknown key "stpe" in [world]; did you mean "step"?`},
		{name: "misspelt body key", scene: mm + floor + part + "dencity = 2\n", want: `unknown key "dencity" in body "cap"; did you mean "density"?`},
		{name: "negative mass", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { sphere = 5 }\nmass = -2\n",
			want: `scene.toml:8: body "cap": mass must be positive, got -2`},
		{name: "zero density", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { sphere = 5 }\ndensity = 0\n",
			want: `body "cap": density must be positive, got 0`},
		{name: "density and mass", scene: mm + floor + part + "mass = 3\n", want: `body "cap": give either density or mass, not both`},
		{name: "no density nor mass", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { sphere = 5 }\n",
			want: `body "cap": a moving body needs a density`},
		{name: "restitution above 1", scene: mm + "[material.abs]\nfriction = 0.3\nrestitution = 1.5\n" + floor + part,
			want: `scene.toml:4: material "abs": restitution must be between 0 and 1, got 1.5`},
		{name: "negative friction", scene: "[material.abs]\nfriction = -0.1\n" + floor + part, want: `material "abs": friction must be >= 0, got -0.1`},
		{name: "static below kinetic", scene: "[material.abs]\nfriction = 0.4\nstatic_friction = 0.3\n" + floor + part,
			want: `material "abs": static_friction 0.3 must be at least friction 0.4`},
		{name: "stiffness not a stiffness", scene: mm + "[material.foam]\nfriction = 0.5\nstiffness = \"40 N\"\n" + floor + part,
			want: `scene.toml:4: material "foam": stiffness must be a stiffness`},
		{name: "friction missing", scene: "[material.abs]\nrestitution = 0.3\n" + floor + part, want: `material "abs": friction is missing`},
		{name: "not finite", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { sphere = 5 }\ndensity = nan\n",
			want: `body "cap": density must be a finite number, got NaN`},
		{name: "unknown material", scene: "[material.abs]\nfriction = 0.3\n" + floor + part + "material = \"abss\"\n",
			want: `body "cap": unknown material "abss"; did you mean "abs"?`},
		{name: "unknown length unit", scene: "units = { length = \"mmm\" }\n" + floor + part, want: `scene.toml:1: units: unknown length unit "mmm"; did you mean "mm"?`},
		{name: "unknown mass unit", scene: "units = { mass = \"kgs\" }\n" + floor + part, want: `units: unknown mass unit "kgs"; did you mean "kg"?`},
		{name: "unit of the wrong kind", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { sphere = 5 }\ndensity = \"2 mm\"\n",
			want: `body "cap": density must be a density, got "2 mm", which is a length (e.g. "1.05 g/cm3")`},
		{name: "unknown unit", scene: mm + floor + part + "velocity = [\"3 furlongs/s\", 0, 0]\n", want: `unknown unit "furlongs"`},
		{name: "not a number", scene: "[world]\nstep = \"fast\"\n" + floor + part, want: `[world] step: "fast" does not start with a number`},
		{name: "missing mesh", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { mesh = \"nope.stl\" }\ndensity = 1\n",
			want: `scene.toml:7: body "cap": mesh file "nope.stl" not found`},
		{name: "truncated mesh", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { mesh = \"bad.stl\" }\ndensity = 1\n",
			files: map[string][]byte{"bad.stl": broken("truncated.stl")}, want: `body "cap": bad.stl`},
		{name: "flat mesh", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { mesh = \"flat.stl\" }\ndensity = 1\n",
			files: map[string][]byte{"flat.stl": broken("flat.stl")}, want: `body "cap": `},
		{name: "duplicate names", scene: floor + part + part, want: `scene.toml:10: body "cap": the name is already used by the body at line 4`},
		{name: "step too large", scene: mm + "[world]\nstep = 0.5\n" + floor + strings.Replace(part, "[0, 0, 5]", "[0, 0, 105]", 1),
			want: `scene.toml:3: [world] step 0.5 s is too large for body "cap"`},
		{name: "moving triangles", scene: mm + floor + "[[body]]\nname = \"cap\"\nshape = { mesh = \"cube.stl\", as = \"triangles\" }\nstatic = false\ndensity = 1\n",
			files: map[string][]byte{"cube.stl": cube}, want: `body "cap": a mesh kept as triangles is always static`},
		{name: "mass on a plane", scene: "[[body]]\nname = \"floor\"\nshape = { plane = [0, 0, 1] }\nmass = 3\n" + part,
			want: `body "floor": a static body does not move, so it takes no mass`},
		{name: "two shapes", scene: floor + "[[body]]\nname = \"cap\"\nshape = { box = [1, 1, 1], sphere = 1 }\ndensity = 1\n",
			want: `body "cap": shape must have exactly one of box, sphere, cylinder, capsule, plane, mesh and pieces, got 2`},
		{name: "unknown shape", scene: floor + "[[body]]\nname = \"cap\"\nshape = { sphre = 1 }\ndensity = 1\n",
			want: `unknown key "sphre" in the shape of body "cap"; did you mean "sphere"?`},
		{name: "no name", scene: floor + "[[body]]\nshape = { sphere = 1 }\ndensity = 1\n", want: `scene.toml:4: [[body]] number 2: name is missing`},
		{name: "kick unknown body", scene: floor + part + "[[kick]]\nbody = \"capp\"\nimpulse = [1, 0, 0]\n",
			want: `scene.toml:10: kick on "capp": no body is named "capp"; did you mean "cap"?`},
		{name: "unknown joint kind", scene: floor + part + "[[joint]]\nname = \"pin\"\nkind = \"hindge\"\nbodies = [\"cap\"]\n",
			want: `scene.toml:11: joint "pin": unknown kind "hindge"; did you mean "revolute" (called "hinge" before)?`},
		{name: "drive of a static body", scene: floor + part + "[[drive]]\nbody = \"floor\"\ntilt = { axis = [0, 1, 0], rate = 1 }\n",
			want: `drive of "floor": body "floor" is static, so it cannot be moved by tilt; write driven = true`},
		{name: "kick static body", scene: floor + part + "[[kick]]\nbody = \"floor\"\nimpulse = [1, 0, 0]\n", want: `body "floor" is static; only bodies moved by gravity and contact can be kicked`},
		{name: "negative edge", scene: floor + "[[body]]\nname = \"cap\"\nshape = { box = [1, -1, 1] }\ndensity = 1\n", want: `body "cap": box y edge must be positive, got -1 m`},
		{name: "bad orientation", scene: floor + part + "orientation = \"upside down\"\n", want: `body "cap": orientation must be "random" or a table`},
		{name: "zero axis", scene: floor + part + "orientation = { axis = [0, 0, 0], angle = 30 }\n", want: `body "cap": orientation axis must not be zero`},
		{name: "short vector", scene: "[world]\ngravity = [0, -9.8]\n" + floor + part, want: `[world] gravity must be an array of 3 numbers, got 2 elements`},
		{name: "no bodies", scene: "[world]\nstep = 0.001\n", want: `the scene has no bodies`},
		{name: "only static bodies", scene: floor, want: `the scene has no moving body`},
		{name: "units not a table", scene: "units = \"mm\"\n" + floor + part, want: `units must be a table`},
		{name: "velocity on a static body", scene: floor + "velocity = [1, 0, 0]\n" + part, want: `body "floor": a static body does not move, so it takes no velocity`},
		{name: "not a bool", scene: "[world]\nuntil_settled = 1\n" + floor + part, want: `[world] until_settled must be true or false, got 1`},
		{name: "bad mesh mode", scene: floor + "[[body]]\nname = \"cap\"\nshape = { mesh = \"cube.stl\", as = \"triangle\" }\nstatic = true\n",
			files: map[string][]byte{"cube.stl": cube}, want: `did you mean "triangles"?`},
		{name: "duration below step", scene: "[world]\nstep = 0.01\nduration = 0.001\n" + floor + part, want: `[world] step 0.01 s is longer than the duration 0.001 s`},
		{name: "pair of unknown material", scene: "[material.abs]\nfriction = 0.3\n[[pair]]\nmaterials = [\"abs\", \"steal\"]\nfriction = 0.2\n" + floor + part,
			want: `[[pair]] abs/steal: unknown material "steal"`},
		{name: "sweep key misspelt", scene: "[material.abs]\nfriction = 0.3\n" + floor + part + "[sweep]\ntrials = 10\n[[sweep.vary]]\nkey = \"material.abs.fricton\"\nvalues = [0.1, 0.2]\n",
			want: `"material.abs" has no "fricton"; did you mean "friction"?`},
		{name: "sweep trials zero", scene: floor + part + "[sweep]\ntrials = 0\n", want: `[sweep] trials must be between 1 and`},
		{name: "missing scene", args: []string{"run", "nope.toml"}, want: `nope.toml: cannot read the scene`},
		{name: "bad sample", scene: floor + part, args: []string{"run", "scene.toml", "--sample", "-1"}, want: `--sample: must be a positive number of seconds`},
		{name: "no scene argument", args: []string{"run"}, want: `run: give one scene file`},
		{name: "unknown flag", scene: floor + part, args: []string{"run", "scene.toml", "--smaple", "0.1"}, want: `did you mean --sample?`},
		{name: "unknown command", args: []string{"rn"}, want: `unknown command "rn"; did you mean "run"?`},
		{name: "sweep without a sweep section", scene: floor + part, args: []string{"sweep", "scene.toml", "-o", "out"}, want: `scene.toml has no [sweep] section`},
		{name: "sweep shard beyond its count", scene: floor + part + "[sweep]\ntrials = 2\n", args: []string{"sweep", "scene.toml", "-o", "out", "--shard", "5/4"},
			want: `--shard: shard "5/4": K must be from 1 to N = 4`},
		{name: "sweep shard count alone", scene: floor + part + "[sweep]\ntrials = 2\n", args: []string{"sweep", "scene.toml", "-o", "out", "--shard-count", "4"},
			want: `--shard-count goes with a Kubernetes Indexed Job`},
		{name: "sweep height range upside down", scene: floor + part + "[sweep]\n[sweep.randomize]\nheight = { cap = [5, 1] }\n",
			args: []string{"sweep", "scene.toml", "-o", "out"}, want: `scene.toml:11: [sweep.randomize] height of "cap": low must not be above high`},
		{name: "sweep spin of a static body", scene: floor + part + "[sweep]\n[sweep.randomize]\nspin = { floor = 3 }\n",
			args: []string{"sweep", "scene.toml", "-o", "out"}, want: `[sweep.randomize] spin: body "floor" is static and cannot be randomized`},
		{name: "sweep no workers", scene: floor + part + "[sweep]\ntrials = 2\n", args: []string{"sweep", "scene.toml", "-o", "out", "-j", "-1"}, want: `-j must be a positive number`},
		{name: "merge a folder that is no sweep", args: []string{"merge", "a", "-o", "b"}, want: `a has no sweep.json: it is not the folder of a sweep`},
		{name: "merge without -o", args: []string{"merge", "a"}, want: `merge: give the folder to merge into with -o DIR`},
		{name: "inspect empty STL", files: map[string][]byte{"empty.stl": broken("empty.stl")}, args: []string{"inspect", "empty.stl"}, want: `empty.stl`},
		{name: "inspect truncated STL", files: map[string][]byte{"t.stl": broken("truncated.stl")}, args: []string{"inspect", "t.stl"}, want: `truncated`},
		{name: "inspect NaN STL", files: map[string][]byte{"n.stl": broken("nan.stl")}, args: []string{"inspect", "n.stl"}, want: `n.stl`},
		{name: "inspect flat STL", files: map[string][]byte{"f.stl": broken("flat.stl")}, args: []string{"inspect", "f.stl"}, want: `zero thickness`},
		{name: "inspect ASCII without end", files: map[string][]byte{"e.stl": broken("noend.stl")}, args: []string{"inspect", "e.stl"}, want: `endsolid`},
		{name: "body inside the floor", scene: mm + floor + "[[body]]\nname = \"box\"\nshape = { box = [10, 10, 10] }\ndensity = 1\nposition = [0, 0, -7.3]\n",
			want: `scene.toml:5: body "box" starts 12.3 mm inside body "floor"; move it up by at least 12.3 mm`},
		{name: "inspect missing file", args: []string{"inspect", "nope.stl"}, want: `nope.stl`},
		{name: "inspect bad units", files: map[string][]byte{"c.stl": cube}, args: []string{"inspect", "c.stl", "--units", "mn"}, want: `--units: unknown length unit "mn"; did you mean "mm"?`},
		{name: "inspect density of the wrong kind", files: map[string][]byte{"c.stl": cube}, args: []string{"inspect", "c.stl", "--density", "2 mm"}, want: `--density: "2 mm" is a length, not a density`},
		{name: "inspect negative density", files: map[string][]byte{"c.stl": cube}, args: []string{"inspect", "c.stl", "--density", "-3"}, want: `--density must be positive`},
	}
	if len(cases) < 25 {
		t.Fatalf("only %d bad inputs", len(cases))
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			if c.scene != "" {
				if err := os.WriteFile(filepath.Join(dir, "scene.toml"), []byte(c.scene), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			for n, d := range c.files {
				if err := os.WriteFile(filepath.Join(dir, n), d, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			args := c.args
			if args == nil {
				args = []string{"run", "scene.toml"}
			}
			args = append(args, "--quiet")
			if args[0] == "run" {
				args = append(args, "-o", filepath.Join(dir, "out"))
			}
			wd, _ := os.Getwd()
			if err := os.Chdir(dir); err != nil {
				t.Fatal(err)
			}
			defer os.Chdir(wd)
			out, errs, code := clatter(t, args...)
			t.Log(strings.TrimSpace(errs))
			if code != exitBad {
				t.Errorf("exit %d, want %d\nstdout:\n%s\nstderr:\n%s", code, exitBad, out, errs)
			}
			if !strings.Contains(errs, c.want) {
				t.Errorf("stderr lacks %q:\n%s", c.want, errs)
			}
			if strings.Contains(errs, "panic") {
				t.Errorf("panicked:\n%s", errs)
			}
		})
	}
}
