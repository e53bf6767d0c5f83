package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"clatter/engine/report"
)

// The packaging examples of testdata/packaging, each run as the README
// shows and checked against what it must do.

func readPackSummary(t *testing.T, dir string) *report.Summary {
	t.Helper()
	var s report.Summary
	readJSON(t, filepath.Join(dir, "summary.json"), &s)
	return &s
}

// exampleSpeedTol: the drop report's speed at first contact, against
// sqrt(2 g h) (free fall), 0.1 %.
const exampleSpeedTol = 1e-3

func TestExampleCartonDrop(t *testing.T) {
	const scene = "../../testdata/packaging/carton-drop.toml"
	dir := t.TempDir()
	out, _, code := clatter(t, "run", scene, "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d:\n%s", code, out)
	}
	for _, want := range []string{"drop     carton on corner 2-3-5 from 610 mm (by mass: the ISTA 1A table)", "end      not on a face: at rest balanced on a corner", "does not replace the drop, vibration"} {
		if !strings.Contains(out, want) {
			t.Errorf("stdout lacks %q:\n%s", want, out)
		}
	}
	d := readPackSummary(t, dir).Drop
	if d == nil {
		t.Fatal("summary.json has no drop")
	}
	// 12 kg: 610 mm in the ISTA 1A table; sqrt(2 g h) in mm/s.
	want := math.Sqrt(2 * 9806.65 * 610) // mm/s
	if d.Height != 610 || math.Abs(d.ImpactSpeed-want) > exampleSpeedTol*want {
		t.Errorf("drop from %g mm at %g mm/s, want 610 mm and %g mm/s", d.Height, d.ImpactSpeed, want)
	}
	if len(d.Impacts) == 0 || d.Impacts[0].Feature == nil || *d.Impacts[0].Feature != "corner 2-3-5" {
		t.Errorf("first impact %+v, want on corner 2-3-5", d.Impacts)
	}
	ev, err := os.ReadFile(filepath.Join(dir, "events.jsonl"))
	if err != nil || !strings.Contains(string(ev), `"features":[null,"corner 2-3-5"]`) {
		t.Errorf("events.jsonl lacks the struck feature of the floor and the carton:\n%s", ev)
	}
}

func TestExampleTenDrops(t *testing.T) {
	dir := t.TempDir()
	out, errs, code := clatter(t, "sweep", "../../testdata/packaging/carton-ten-drops.toml", "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d:\n%s\n%s", code, out, errs)
	}
	if !strings.Contains(out, "does not replace the drop, vibration") || !strings.Contains(out, "drops (drops.csv)") {
		t.Errorf("stdout lacks the drops table or the caution:\n%s", out)
	}
	rows := readCSV(t, filepath.Join(dir, "drops.csv"))
	if got := strings.Join(rows[0], ","); got != "case,trial,drop.number,strike,height,impact_speed,second_feature,secondary_impact_speed,peak_spin,final_face,turned_over,peak_acceleration" {
		t.Fatalf("drops.csv header %q", got)
	}
	// ISTA 1A's sequence for a 400 x 300 x 250 carton: corner 2-3-5, edges
	// shortest first (2-5: 250, 3-5: 300, 2-3: 400), faces in pairs of
	// smallest area first (5-6, 2-4, 1-3).
	strikes := []string{"corner 2-3-5", "edge 2-5", "edge 3-5", "edge 2-3", "face 5", "face 6", "face 2", "face 4", "face 1", "face 3"}
	if len(rows) != 11 {
		t.Fatalf("%d drops, want 10", len(rows)-1)
	}
	want := math.Sqrt(2 * 9806.65 * 610) // mm/s
	for i, r := range rows[1:] {
		if r[3] != strikes[i] || r[4] != "610" {
			t.Errorf("drop %d: %s from %s mm, want %s from 610", i+1, r[3], r[4], strikes[i])
		}
		if v := parseFloat(t, r[5]); math.Abs(v-want) > exampleSpeedTol*want {
			t.Errorf("drop %d: impact speed %g mm/s, sqrt(2 g h) = %g", i+1, v, want)
		}
		// A face drop lands flat and stays on the face it struck.
		if strings.HasPrefix(r[3], "face ") && (r[9] != strings.TrimPrefix(r[3], "face ") || r[10] != "false") {
			t.Errorf("drop %d on %s ended on face %q, turned over %s", i+1, r[3], r[9], r[10])
		}
	}
}

// palletTol: the loads on the tilting pallet tip or slide within half a
// degree of statics; the table turns at 1 deg/s, and a carton just past
// its critical tilt takes a few tenths of a second to leave the onset
// bounds (1e-3 rad, 0.05 mm) while the table turns on.
const palletTol = 0.5

func TestExamplePalletTilt(t *testing.T) {
	dir := t.TempDir()
	out, _, code := clatter(t, "run", "../../testdata/packaging/pallet-tilt.toml", "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d:\n%s", code, out)
	}
	if !strings.Contains(out, "does not replace the drop, vibration") {
		t.Errorf("stdout lacks the caution:\n%s", out)
	}
	sum := readPackSummary(t, dir)
	get := func(name string) report.Body {
		for _, b := range sum.Bodies {
			if b.Name == name {
				return b
			}
		}
		t.Fatalf("no %q", name)
		return report.Body{}
	}
	// Statics of a rigid block on an incline: tips at atan(b' / h') with
	// b' and h' from the centre of mass to the downhill edge, slides at
	// atan(mu_s).
	tall, low := get("tall carton"), get("low carton")
	tipWant := math.Atan(160.0/380) * 180 / math.Pi
	if tall.TippedAt == nil || math.Abs(tall.TippedAt.Tilt-tipWant) > palletTol || tall.SlidAt != nil && tall.SlidAt.Time < tall.TippedAt.Time {
		t.Errorf("tall carton: tipped %+v, slid %+v; want it to tip first at %.2f deg", tall.TippedAt, tall.SlidAt, tipWant)
	}
	slideWant := math.Atan(0.45) * 180 / math.Pi
	if low.SlidAt == nil || math.Abs(low.SlidAt.Tilt-slideWant) > palletTol || low.TippedAt != nil && low.TippedAt.Time < low.SlidAt.Time {
		t.Errorf("low carton: tipped %+v, slid %+v; want it to slide first at %.2f deg", low.TippedAt, low.SlidAt, slideWant)
	}
	if tall.TippedAt != nil && low.SlidAt != nil {
		t.Logf("tall carton tips at %.2f deg (statics %.2f); low carton slides at %.2f (statics %.2f)", tall.TippedAt.Tilt, tipWant, low.SlidAt.Tilt, slideWant)
	}
	// The driven table is in trajectory.csv.
	tr, err := os.ReadFile(filepath.Join(dir, "trajectory.csv"))
	if err != nil || !strings.Contains(string(tr), ",table,") {
		t.Errorf("trajectory.csv lacks the driven table")
	}
}

func TestInspectSceneBody(t *testing.T) {
	out, _, code := clatter(t, "inspect", "../../testdata/packaging/pallet-tilt.toml", "--body", "pallet", "--json")
	if code != exitOK {
		t.Fatalf("exit %d:\n%s", code, out)
	}
	var p bodyInspection
	if err := json.Unmarshal([]byte(out), &p); err != nil {
		t.Fatal(err)
	}
	// Three runners 1200 x 100 x 100 at z = 50 and a deck 1200 x 1000 x 22
	// at z = 111, equal density: the centre of mass is their
	// volume-weighted mean height, (3 x 12e6 x 50 + 26.4e6 x 111) / 62.4e6
	// = 75.8077 mm.
	// printedTol: the expected value is written to 6 significant digits.
	const printedTol = 1e-4 // mm
	if p.Pieces != 4 || math.Abs(p.CenterOfMass[2]-75.8077) > printedTol || p.Mass != 25 {
		t.Errorf("pallet: %d pieces, mass %g, centre of mass %v", p.Pieces, p.Mass, p.CenterOfMass)
	}
	if len(p.PackageFaces) != 6 || p.PackageFaces[2].Name != "bottom" {
		t.Errorf("package faces %+v", p.PackageFaces)
	}
	_, errs, code := clatter(t, "inspect", "../../testdata/packaging/pallet-tilt.toml", "--body", "palet")
	if code != exitBad || !strings.Contains(errs, `no body "palet"`) {
		t.Errorf("a misspelt body: exit %d, %s", code, errs)
	}
}

func TestPackagingBadInputExits2(t *testing.T) {
	cases := []struct{ name, text, want string }{
		{"too heavy for the table", `
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "crate"
mass = 90
shape = { box = [1, 1, 1] }
[drop]
body = "crate"
strike = "face 3"
height = "by mass"
`, `scene.toml:12: [drop] height "by mass": the body's mass 90 kg is beyond the drop-height table`},
		{"a strike that is no edge", `
[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
[[body]]
name = "crate"
mass = 9
shape = { box = [1, 1, 1] }
[drop]
body = "crate"
strike = "edge 5-6"
height = 0.5
`, `scene.toml:11: [drop] strike "edge 5-6": faces 5 and 6 do not meet`},
		{"centre of mass outside", `
[[body]]
name = "crate"
mass = 9
shape = { box = [1, 1, 1] }
center_of_mass = [0, 0, 0.6]
`, `scene.toml:6: body "crate": center_of_mass [0 0 0.6] m lies outside the body's shape`},
	}
	for _, c := range cases {
		p := filepath.Join(t.TempDir(), "scene.toml")
		if err := os.WriteFile(p, []byte(c.text), 0o644); err != nil {
			t.Fatal(err)
		}
		_, errs, code := clatter(t, "run", p, "-o", t.TempDir(), "--quiet")
		if code != exitBad || !strings.Contains(errs, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want exit 2 and %q", c.name, code, errs, c.want)
		}
	}
}

func TestInspectSceneWithoutBody(t *testing.T) {
	_, errs, code := clatter(t, "inspect", "../../testdata/packaging/pallet-tilt.toml")
	if code != exitBad || !strings.Contains(errs, "--body NAME") {
		t.Errorf("a scene without --body: exit %d, %s", code, errs)
	}
}

// TestDropSecondFeatureInSummary checks that a drop that turns over names
// in summary.json the feature that struck second, as drops.csv does: the
// first impact in its list on a feature other than the struck one, at
// that impact's speed. An edge drop kicked below its centre of mass as it
// falls spins, so a face strikes after the edge.
func TestDropSecondFeatureInSummary(t *testing.T) {
	b, err := os.ReadFile("../../testdata/packaging/carton-drop.toml")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(b), `strike = "corner 2-3-5"`, `strike = "edge 3-5"`, 1) + `
[[kick]]
body = "carton"
time = 0.1
impulse = [300, 0, 0]
at = [0, 0, 600]
`
	dir := t.TempDir()
	scene := filepath.Join(dir, "kicked.toml")
	if err := os.WriteFile(scene, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, code := clatter(t, "run", scene, "-o", dir, "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d:\n%s", code, out)
	}
	raw, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil || !strings.Contains(string(raw), `"second_feature"`) {
		t.Fatalf("summary.json has no second_feature (%v)", err)
	}
	d := readPackSummary(t, dir).Drop
	if d == nil || len(d.Impacts) == 0 || d.Impacts[0].Feature == nil {
		t.Fatalf("drop %+v: no first impact", d)
	}
	var second *report.DropImpact
	for i := range d.Impacts {
		if f := d.Impacts[i].Feature; f != nil && *f != *d.Impacts[0].Feature {
			second = &d.Impacts[i]
			break
		}
	}
	if second == nil {
		t.Fatalf("the kicked drop struck only %s: %+v", *d.Impacts[0].Feature, d.Impacts)
	}
	if d.SecondFeature == nil || *d.SecondFeature != *second.Feature ||
		d.SecondaryImpactSpeed == nil || *d.SecondaryImpactSpeed != second.NormalSpeed {
		t.Errorf("second_feature %v at %v, want %s at %g (the impacts list)", d.SecondFeature, d.SecondaryImpactSpeed, *second.Feature, second.NormalSpeed)
	}
}
