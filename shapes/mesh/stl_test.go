package mesh_test

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"clatter/shapes"
	"clatter/shapes/mesh"
	"clatter/testdata/gen/partgen"
)

// TestGeneratedFilesUpToDate: the committed parts and broken files are
// exactly what the generator writes, and nothing else lies beside them.
func TestGeneratedFilesUpToDate(t *testing.T) {
	files, err := partgen.Files()
	if err != nil {
		t.Fatal(err)
	}
	var gen []string
	for _, f := range files {
		gen = append(gen, f.Path)
		disk, err := os.ReadFile(dir(filepath.FromSlash(f.Path)))
		if err != nil {
			t.Errorf("%v (run: go run ./testdata/gen)", err)
			continue
		}
		if !bytes.Equal(disk, f.Data) {
			t.Errorf("testdata/%s differs from the generator's output (run: go run ./testdata/gen)", f.Path)
		}
	}
	for _, sub := range []string{"parts", "broken"} {
		entries, err := os.ReadDir(dir(sub))
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if p := sub + "/" + e.Name(); !slices.Contains(gen, p) {
				t.Errorf("testdata/%s is not written by the generator; remove it or add it to testdata/gen", p)
			}
		}
	}
}

// TestBrokenFiles: every broken file is refused with an error that names
// the file and the cause, except the open mesh and the inside-out one,
// which load with a warning.
func TestBrokenFiles(t *testing.T) {
	cases := []struct {
		file string
		want []string // substrings of the error, or of the warning if warn
		warn bool
	}{
		{"empty.stl", []string{"empty file"}, false},
		{"truncated.stl", []string{"truncated binary STL", "12 triangles", "ends after 454 bytes"}, false},
		{"wrong_count.stl", []string{"triangle count in the header (11) disagrees with the file size", "hold 12 triangles"}, false},
		{"flat.stl", []string{"zero thickness", "flat or degenerate"}, false},
		{"nan.stl", []string{"facet 5", "not a finite number", "NaN"}, false},
		{"noend.stl", []string{`without "endsolid"`}, false},
		{"notriangles.stl", []string{"no triangles"}, false},
		{"open.stl", []string{"mesh is open (4 boundary edges); mass properties taken from its convex hull"}, true},
		{"inward.stl", []string{"faced inward"}, true},
	}
	for _, c := range cases {
		path := dir(filepath.Join("broken", c.file))
		p, err := mesh.LoadPart(path, mesh.Millimetre)
		var msg string
		switch {
		case c.warn && err != nil:
			t.Errorf("%s: want a warning, got error %v", c.file, err)
			continue
		case c.warn && len(p.Warnings) != 1:
			t.Errorf("%s: want one warning, got %q", c.file, p.Warnings)
			continue
		case c.warn:
			msg = p.Warnings[0]
		case err == nil:
			t.Errorf("%s: loaded without error", c.file)
			continue
		default:
			msg = err.Error()
		}
		if !strings.HasPrefix(msg, path) {
			t.Errorf("%s: message does not start with the file name: %q", c.file, msg)
		}
		for _, w := range c.want {
			if !strings.Contains(msg, w) {
				t.Errorf("%s: message %q lacks %q", c.file, msg, w)
			}
		}
		t.Logf("%-16s %s", c.file, msg)
	}
}

// TestFlatIsDegenerate: the zero-thickness error wraps shapes.ErrDegenerate.
func TestFlatIsDegenerate(t *testing.T) {
	_, err := mesh.LoadPart(dir("broken/flat.stl"), mesh.Millimetre)
	if !errors.Is(err, shapes.ErrDegenerate) {
		t.Fatalf("got %v, want an error wrapping shapes.ErrDegenerate", err)
	}
}

func readBytes(t *testing.T, file string) []byte {
	t.Helper()
	b, err := os.ReadFile(dir(file))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestSTLVariants: variants of valid files that real exporters write, and
// damaged ones the committed files do not cover, read from memory.
func TestSTLVariants(t *testing.T) {
	ascii := readBytes(t, "parts/box.stl")
	bin := readBytes(t, "parts/cube.stl")
	binSolidHeader := bytes.Clone(bin)
	copy(binSolidHeader, "solid cube, a binary file whose header looks like ASCII")
	binSolidBadCount := bytes.Clone(binSolidHeader)
	binSolidBadCount[80] = 13
	replaceFirstLine := func(b []byte, first string) []byte {
		i := bytes.IndexByte(b, '\n')
		return append([]byte(first), b[i:]...)
	}
	replace := func(b []byte, old, new string) []byte { return bytes.Replace(b, []byte(old), []byte(new), 1) }

	cases := []struct {
		name  string
		data  []byte
		unit  mesh.Unit
		verts int    // vertices expected when it loads
		err   string // substring of the error, "" when it must load
	}{
		{"bare solid line", replaceFirstLine(ascii, "solid"), mesh.Millimetre, 8, ""},
		{"byte-order mark", append([]byte("\xef\xbb\xbf"), ascii...), mesh.Millimetre, 8, ""},
		{"leading blanks", append([]byte("  \t"), ascii...), mesh.Millimetre, 8, ""},
		{"CRLF lines", bytes.ReplaceAll(ascii, []byte("\n"), []byte("\r\n")), mesh.Millimetre, 8, ""},
		{"binary header starting with solid", binSolidHeader, mesh.Millimetre, 8, ""},
		{"binary header starting with solid, wrong count", binSolidBadCount, mesh.Millimetre, 0, "triangle count in the header (13)"},
		{"too short for anything", []byte("hello"), mesh.Millimetre, 0, "not an STL file"},
		{"header only, count 0", make([]byte, 84), mesh.Millimetre, 0, "no triangles"},
		{"ASCII coordinate too large for float32", replace(ascii, "vertex 0 0 0", "vertex 1e39 0 0"), mesh.Millimetre, 0, "too large for a float32"},
		{"ASCII NaN coordinate", replace(ascii, "vertex 0 0 0", "vertex nan 0 0"), mesh.Millimetre, 0, "facet 1: corner 1 is not a finite number"},
		{"ASCII infinite coordinate", replace(ascii, "vertex 0 0 0", "vertex 0 inf 0"), mesh.Millimetre, 0, "not a finite number"},
		{"ASCII facet missing a vertex", replace(ascii, "    vertex 0 0 10\n", ""), mesh.Millimetre, 0, `:6: ASCII STL: "vertex" expected`},
		{"ASCII word instead of a number", replace(ascii, "vertex 0 0 0", "vertex zero 0 0"), mesh.Millimetre, 0, ":4: ASCII STL"},
		{"two ASCII solids in one file", append(bytes.Clone(ascii), ascii...), mesh.Millimetre, 0, "holds 2 solids"},
		{"zero unit", ascii, 0, 0, "unit must be positive"},
		{"negative unit", ascii, -1, 0, "unit must be positive"},
		{"all triangles collapsed", []byte("solid p\nfacet normal 0 0 1\nouter loop\nvertex 1 1 1\nvertex 1 1 1\nvertex 2 2 2\nendloop\nendfacet\nendsolid p\n"), mesh.Millimetre, 0, "zero area"},
	}
	for _, c := range cases {
		m, err := mesh.ReadSTL(bytes.NewReader(c.data), "part.stl", c.unit)
		switch {
		case c.err == "" && err != nil:
			t.Errorf("%s: %v", c.name, err)
		case c.err == "" && len(m.Vertices) != c.verts:
			t.Errorf("%s: %d vertices, want %d", c.name, len(m.Vertices), c.verts)
		case c.err != "" && err == nil:
			t.Errorf("%s: loaded, want an error with %q", c.name, c.err)
		case c.err != "" && (!strings.Contains(err.Error(), c.err) || !strings.HasPrefix(err.Error(), "part.stl")):
			t.Errorf("%s: error %q, want the file name and %q", c.name, err, c.err)
		}
	}
}

// TestLoadMissingFile: the operating system's error names the path.
func TestLoadMissingFile(t *testing.T) {
	_, err := mesh.LoadSTL(dir("parts/no-such-part.stl"), mesh.Millimetre)
	if err == nil || !strings.Contains(err.Error(), "no-such-part.stl") {
		t.Fatalf("got %v", err)
	}
}

// committed returns the bytes of every committed STL file, in path order.
func committed(t testing.TB) [][]byte {
	var out [][]byte
	for _, sub := range []string{"parts", "broken"} {
		paths, err := filepath.Glob(dir(filepath.Join(sub, "*.stl")))
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range paths {
			b, err := os.ReadFile(p)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, b)
		}
	}
	return out
}

// checkRead reads data as an STL and makes a part of it: it may fail, but
// must not panic, and whatever loads must be a well-formed mesh.
func checkRead(t *testing.T, data []byte) {
	t.Helper()
	m, err := mesh.ReadSTL(bytes.NewReader(data), "fuzz.stl", mesh.Millimetre)
	if err != nil {
		if !strings.HasPrefix(err.Error(), "fuzz.stl") {
			t.Fatalf("error does not name the file: %v", err)
		}
		return
	}
	if len(m.Triangles) == 0 {
		t.Fatal("loaded a mesh without triangles")
	}
	for _, tr := range m.Triangles {
		for _, v := range tr {
			if v < 0 || int(v) >= len(m.Vertices) {
				t.Fatalf("triangle %v indexes outside %d vertices", tr, len(m.Vertices))
			}
		}
		if tr[0] == tr[1] || tr[1] == tr[2] || tr[2] == tr[0] {
			t.Fatalf("collapsed triangle %v survived", tr)
		}
	}
	p, err := mesh.NewPart(m)
	if err != nil {
		return
	}
	if ms := p.Mass(1000); !(ms.Volume > 0) {
		t.Fatalf("part with volume %g", ms.Volume)
	}
}

// TestDamagedNeverPanics cuts every committed file at many lengths and
// flips bytes in it; reading must fail or succeed, never panic.
func TestDamagedNeverPanics(t *testing.T) {
	for _, b := range committed(t) {
		step := max(1, len(b)/150)
		for n := 0; n <= len(b); n += step {
			checkRead(t, b[:n])
		}
		for i := 0; i < len(b); i += step {
			d := bytes.Clone(b)
			d[i] ^= 0xa5
			checkRead(t, d)
		}
	}
}

// FuzzReadSTL feeds arbitrary bytes to the STL reader and the part
// builder, seeded with every committed file.
func FuzzReadSTL(f *testing.F) {
	for _, b := range committed(f) {
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, data []byte) { checkRead(t, data) })
}
