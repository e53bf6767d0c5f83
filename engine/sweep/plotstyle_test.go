package sweep

import (
	"testing"

	"gonum.org/v1/plot/vg"

	"clatter/engine/report"
)

// TestFaceNames checks that faces are named by their outward normal, as
// a box's faces are listed by `clatter inspect`: +x, -x, +y, -y, +z, -z.
func TestFaceNames(t *testing.T) {
	m := &Meta{Bodies: []BodyMeta{{Name: "box", Faces: []FaceMeta{
		{Normal: &[3]float64{1, 0, 0}}, {Normal: &[3]float64{0, 0, -1}},
		{Normal: &[3]float64{0.6, 0, 0.8}}, {Axis: &[3]float64{0, 1, 0}},
	}}}}
	for _, c := range []struct {
		face int
		want string
	}{
		{0, "face 0 (+x)"}, {1, "face 1 (-z)"}, {2, "face 2 (0.60, 0.00, 0.80)"},
		{3, "face 3 (round, axis +y)"}, {-1, "no face"}, {9, "face 9"},
	} {
		if got := faceName(m, 0, c.face); got != c.want {
			t.Errorf("face %d: %q, want %q", c.face, got, c.want)
		}
	}
	// Grouped: faces 0 and 1 in one group are named together.
	m.GroupFaces = true
	m.Bodies[0].Faces[0].Group, m.Bodies[0].Faces[1].Group = 0, 0
	m.Bodies[0].Faces[2].Group, m.Bodies[0].Faces[3].Group = 2, 3
	if got, want := faceName(m, 0, 0), "face 0 (+x; -z)"; got != want {
		t.Errorf("grouped: %q, want %q", got, want)
	}
}

// TestKeyUnits checks the axis titles of varied keys.
func TestKeyUnits(t *testing.T) {
	u := report.Units{Length: "mm", Mass: "g"}
	for key, want := range map[string]string{
		"material.steel.friction":   "material.steel.friction (no unit)",
		"body.cube.position.2":      "body.cube.position.2 (mm)",
		"world.step":                "world.step (s)",
		"body.cube.mass":            "body.cube.mass (g)",
		"drop.number":               "drop number in the ten-drop sequence (drops.csv names its strike)",
		"something.else.altogether": "something.else.altogether (in the scene's units)",
	} {
		if got := keyUnit(key, u); got != want {
			t.Errorf("%s: %q, want %q", key, got, want)
		}
	}
}

// TestFacesNoTrialReachedLeftOut checks that faces without a trial get no
// series (and so no error bars).
func TestFacesNoTrialReachedLeftOut(t *testing.T) {
	rows := []CaseRow{
		{Body: "b", Face: 0, Count: 3}, {Body: "b", Face: 1, Count: 0},
		{Body: "b", Face: 2, Count: 5}, {Body: "b", Face: -1, Count: 0},
	}
	got := topFaces(rows, "b", 8)
	if len(got) != 2 || got[0] != 0 || got[1] != 2 {
		t.Errorf("faces %v, want [0 2]", got)
	}
}

// TestWrapTitle checks that a title too wide for its plot is broken at the
// separator nearest its middle, and a short one is left alone.
func TestWrapTitle(t *testing.T) {
	width := func(s string) vg.Length { return vg.Length(len(s)) } // one unit a character
	for _, c := range []struct {
		title string
		room  vg.Length
		want  string
	}{
		{"short title", 100, "short title"},
		{"bracket: fraction of trials resting on each face (the 8 most frequent); symmetric faces grouped", 60,
			"bracket: fraction of trials resting on each face\n(the 8 most frequent); symmetric faces grouped"},
		{"no separator in this long one", 10, "no separator in this long one"},
	} {
		if got := wrapTitle(c.title, width, c.room); got != c.want {
			t.Errorf("wrapTitle(%q) = %q, want %q", c.title, got, c.want)
		}
	}
}

// TestShortKey checks the keys named in a gate plot's legend.
func TestShortKey(t *testing.T) {
	for key, want := range map[string]string{
		"material.steel.friction": "friction",
		"body.cube.position.2":    "position.2",
		"drop.height":             "height",
		"seed":                    "seed",
	} {
		if got := shortKey(key); got != want {
			t.Errorf("%s: %q, want %q", key, got, want)
		}
	}
}
