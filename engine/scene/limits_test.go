package scene

import (
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"
)

// hostileBase is a valid scene with places for hostile values.
const hostileBase = `[world]
duration = 0.1
[material.abs]
friction = FRICTION
restitution = 0.3
[[body]]
name = "floor"
static = true
shape = { plane = PLANE }
material = "abs"
[[body]]
name = "cap"
shape = { box = BOX }
material = "abs"
density = DENSITY
position = [0, 0, 0.05]
orientation = { axis = AXIS, angle = 30 }
`

func hostile(repl ...string) string {
	defaults := map[string]string{"FRICTION": "0.3", "PLANE": "[0, 0, 1]", "BOX": "[0.02, 0.02, 0.02]", "DENSITY": "1000", "AXIS": "[0, 1, 0]"}
	for i := 0; i+1 < len(repl); i += 2 {
		defaults[repl[i]] = repl[i+1]
	}
	s := hostileBase
	for k, v := range defaults {
		s = strings.Replace(s, k, v, 1)
	}
	return s
}

func TestHostileValuesRefused(t *testing.T) {
	// Numbers that overflow after conversion or normalisation, or lie far
	// outside any physical range, are refused on their line with what to
	// do; before these checks each was read as something else (no
	// rotation, no plane, 10 mm, a valid friction).
	if _, err := Parse([]byte(hostile()), "ok.toml", Options{}); err != nil {
		t.Fatalf("the base scene: %v", err)
	}
	power256 := `"10` + strings.Repeat(" m9", 28) + ` m4"`
	cases := []struct {
		name, key, value, want string
		line                   int
	}{
		{"axis that overflows its length", "AXIS", "[1e300, 1e300, 0]", "orientation axis[0] is 1e+300, beyond the largest plain number", 17},
		{"plane normal that overflows", "PLANE", "[0, 0, 1e300]", "plane normal[2] is 1e+300, beyond the largest plain number", 9},
		{"unit to the power 256", "DENSITY", power256, "raises length to a power beyond 6", 15},
		{"friction 1e308", "FRICTION", "1e308", "friction 1e+308 is beyond any measured surface", 4},
		{"box edge 1e308 m", "BOX", "[1e308, 0.02, 0.02]", "box[0] is 1e+308 m, beyond what clatter accepts for a length (at most 1e+06 m", 13},
		{"density overflowing in its unit", "DENSITY", `"1e306 g/mm3"`, "density overflows", 15},
		{"density beyond its range", "DENSITY", `"1e300 g/mm3"`, "density is 1e+306 kg/m3, beyond what clatter accepts for a density", 15},
		{"a density so small the inertia has no inverse", "DENSITY", `"1e-305 g/cm3"`, "moments of inertia are beyond the range of numbers, or zero", 13},
		{"a plain number by its unit", "DENSITY", `"1 km6/mm6"`, "density is 1e+36 kg/m3, beyond", 15},
	}
	for _, c := range cases {
		msg := parseErr(t, hostile(c.key, c.value))
		if !strings.Contains(msg, c.want) || !strings.Contains(msg, ":"+strconv.Itoa(c.line)+":") {
			t.Errorf("%s: %q, want line %d and %q", c.name, msg, c.line, c.want)
		}
	}
}

func TestHostileFilesRefused(t *testing.T) {
	// Files that would exhaust memory, hang or never end are refused
	// before they are parsed, quickly, with the reason.
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	cases := []struct {
		name, path, want string
	}{
		{"100000 nested arrays", write("deep.toml", "a = "+strings.Repeat("[", 100000)+strings.Repeat("]", 100000)), "nested more than 32 deep"},
		{"8000 nested inline tables", write("tables.toml", "a = "+strings.Repeat("{b = ", 8000)+"1"+strings.Repeat("}", 8000)), "nested more than 32 deep"},
		{"too many values", write("many.toml", "a = ["+strings.Repeat("0,", MaxValues)+"0]"), "more than 1000000 values"},
		{"a folder", dir, "a folder, not a file"},
		{"larger than a scene", write("big.toml", "# "+strings.Repeat("x", MaxSceneBytes)+"\n"), "larger than the 16 MiB clatter reads"},
	}
	if runtime.GOOS != "windows" {
		fifo := filepath.Join(dir, "scene.fifo")
		if err := mkfifo(fifo); err == nil {
			cases = append(cases, struct{ name, path, want string }{"a fifo", fifo, "a named pipe (fifo), not a regular file"})
		}
		if _, err := os.Stat("/dev/zero"); err == nil {
			cases = append(cases, struct{ name, path, want string }{"/dev/zero", "/dev/zero", "a device, not a regular file"})
		}
	}
	for _, c := range cases {
		done := make(chan error, 1)
		go func() { _, err := Load(c.path); done <- err }()
		select {
		case err := <-done:
			if !errors.Is(err, ErrBadScene) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: %v, want a bad scene with %q", c.name, err, c.want)
			}
		case <-time.After(hostileWait):
			t.Fatalf("%s: Load still reading after %v", c.name, hostileWait)
		}
	}
}

// hostileWait is how long a refusal may take: each is a check of the
// file's kind or a scan of at most 16 MiB, milliseconds of work, so a
// minute means it hangs, even on a loaded machine.
const hostileWait = time.Minute

func TestNestingScanFollowsStrings(t *testing.T) {
	// Brackets inside strings and comments are not nesting.
	deepText := strings.Repeat("[", 40)
	for _, src := range []string{
		"a = \"" + deepText + "\"\n",
		"a = '" + deepText + "'\n",
		"a = \"\"\"\n" + deepText + "\n\"\"\"\n",
		"a = '''" + deepText + "'''\n",
		"# " + deepText + "\na = 1\n",
		"a = \"\\\"" + deepText + "\"\n",
	} {
		if e := checkShape([]byte(src), "s.toml"); e != nil {
			t.Errorf("%q: %v", src, e)
		}
	}
	if e := checkShape([]byte("a = 1\nb = "+deepText), "s.toml"); e == nil || e.Line != 2 {
		t.Errorf("deep array on line 2: %v", e)
	}
}
