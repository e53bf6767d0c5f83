package page

import (
	"bytes"
	"context"
	"encoding/base64"
	"encoding/json"
	stdhtml "html"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/sweep"
	"clatter/engine/view"
	"clatter/engine/view/viewtest"
)

// runFolder runs the block-on-a-fixture scene into a folder with its
// animation, and with its pictures if asked.
func runFolder(t *testing.T, pictures bool) string {
	t.Helper()
	s, err := scene.Load("../../../testdata/scenes/fixture.toml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	rec := view.NewRecorder(s)
	if _, err := report.Run(context.Background(), s, report.Options{Dir: dir, Observe: rec.Observe}); err != nil {
		t.Fatal(err)
	}
	if err := rec.WriteGLB(filepath.Join(dir, view.AnimationFile)); err != nil {
		t.Fatal(err)
	}
	if pictures {
		if err := rec.WritePictures(filepath.Join(dir, view.StartPicture), filepath.Join(dir, view.EndPicture)); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// TestPageHoldsEverything checks that the page carries the caution, the
// tables, the pictures and the animation, byte for byte, and refers to
// nothing outside itself.
func TestPageHoldsEverything(t *testing.T) {
	dir := runFolder(t, true)
	out, err := Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, want := range []string{Caution, "<table>", "trajectory.csv", "summary.json: bodies", `src="data:image/png;base64,`} {
		if !strings.Contains(html, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	if n := strings.Count(html, "data:image/png;base64,"); n != 2 {
		t.Errorf("%d pictures in the page, want start.png and end.png", n)
	}
	m := regexp.MustCompile(`<div id="glb" hidden>([^<]+)</div>`).FindStringSubmatch(html)
	if m == nil {
		t.Fatal("the page holds no animation")
	}
	glb, _ := base64.StdEncoding.DecodeString(stdhtml.UnescapeString(m[1]))
	want, _ := os.ReadFile(filepath.Join(dir, view.AnimationFile))
	if !bytes.Equal(glb, want) {
		t.Error("the animation in the page differs from animation.glb")
	}
	// Offline: no address of another place to load from.
	if regexp.MustCompile(`(src|href)="(https?:)?//`).MatchString(html) {
		t.Error("the page loads something from the network")
	}
}

// TestPageNeedsResults checks that a folder without results is refused.
func TestPageNeedsResults(t *testing.T) {
	if _, err := Write(t.TempDir()); err == nil || !strings.Contains(err.Error(), "summary.json") {
		t.Errorf("an empty folder gave %v, want an error naming what is missing", err)
	}
}

// TestPageInBrowser opens the page in headless Chromium at the start of
// the motion and at its end (a time in the address past the end is held
// at the end). The player must draw the bodies (the DOM records the
// triangles drawn and the time shown), the tables must be there, and the
// screenshots must show the block's orange, which only the player can
// have drawn (the folder holds no pictures), lower at the end than at the
// start, since the block falls onto the fixture.
func TestPageInBrowser(t *testing.T) {
	// Keyframe times are float32 in glTF: 7 significant digits.
	const float32Tol = 1e-6
	dir := runFolder(t, false)
	out, err := Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	dom := string(viewtest.Headless(t, out, "--dump-dom"))
	m := regexp.MustCompile(`data-drawn="(\d+)"`).FindStringSubmatch(dom)
	if m == nil {
		t.Fatalf("the player drew nothing (no data-drawn in the page's DOM)")
	}
	// Visible triangles at the start: at least the block's 3 faces (6
	// triangles) and the floor patch, whose tiles are at most a sixth of
	// its side: 6 x 6 tiles or more, 72 triangles.
	if n, _ := strconv.Atoi(m[1]); n < 72+6 {
		t.Errorf("the player drew %d triangles, want the floor's 72 or more and the bodies' faces", n)
	}
	if strings.Count(dom, "<table>") < 2 {
		t.Errorf("the page shows %d tables, want the summary and bodies at least", strings.Count(dom, "<table>"))
	}
	orange, startRow, colours := screenshot(t, out)
	if orange < 300 {
		t.Errorf("the screenshot shows %d pixels of the block's orange, want the block drawn by the player", orange)
	}
	if colours < 50 {
		t.Errorf("the screenshot has %d colours: a blank page", colours)
	}

	end := out + "#t=99"
	m = regexp.MustCompile(`data-time="([0-9.eE+-]+)"`).FindStringSubmatch(string(viewtest.Headless(t, end, "--dump-dom")))
	if m == nil {
		t.Fatal("the player shows no time (no data-time in the page's DOM)")
	}
	// The run's last sample: its end time, from its summary.json.
	var sum struct{ Time float64 }
	if b, err := os.ReadFile(filepath.Join(dir, report.SummaryFile)); err != nil || json.Unmarshal(b, &sum) != nil || sum.Time <= 0 {
		t.Fatalf("cannot read the run's end time from its summary: %v", err)
	}
	if tm, _ := strconv.ParseFloat(m[1], 64); math.Abs(tm-sum.Time) > float32Tol {
		t.Errorf("the player shows %s s at the end, want the run's %g s", m[1], sum.Time)
	}
	if _, endRow, _ := screenshot(t, end); endRow <= startRow {
		t.Errorf("the block is drawn at row %.0f at the start and %.0f at the end: it fell, so it must be lower", startRow, endRow)
	}
}

// screenshot takes a screenshot of a page and counts the pixels of the
// block's orange (the palette's (230, 159, 0), shaded), their mean row,
// and the colours.
func screenshot(t *testing.T, page string) (orange int, row float64, colours int) {
	shot := filepath.Join(t.TempDir(), "shot.png")
	viewtest.Headless(t, page, "--screenshot="+shot)
	img := viewtest.ReadPNG(t, shot)
	seen := map[uint32]bool{}
	sum := 0
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			r, g, bl = r>>8, g>>8, bl>>8
			seen[r<<16|g<<8|bl] = true
			if r > 90 && bl < 30 && g > r/3 && g < r {
				orange++
				sum += y
			}
		}
	}
	if orange > 0 {
		row = float64(sum) / float64(orange)
	}
	return orange, row, len(seen)
}

// TestStudyPage writes the page of a small study: its cases come first,
// then its plots, each embedded, and the hint to replay a trial.
func TestStudyPage(t *testing.T) {
	src, err := os.ReadFile("../../../testdata/sweeps/cube.toml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	file := filepath.Join(dir, "cube.toml")
	small := strings.Replace(string(src), "trials = 60", "trials = 4", 1)
	if err := os.WriteFile(file, []byte(small), 0o644); err != nil {
		t.Fatal(err)
	}
	st, err := sweep.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "study")
	if _, err := st.Run(context.Background(), sweep.Options{Dir: out, Workers: 1}); err != nil {
		t.Fatal(err)
	}
	res, err := sweep.Finish(out)
	if err != nil {
		t.Fatal(err)
	}
	path, err := Write(out)
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	pngs := 0
	for _, f := range res.Meta.Files {
		if strings.HasSuffix(f, ".png") {
			pngs++
		}
	}
	if n := strings.Count(html, "data:image/png;base64,"); n != pngs || n == 0 {
		t.Errorf("%d plots in the page, want the study's %d", n, pngs)
	}
	cases, plot := strings.Index(html, "<b>cases.csv</b>"), strings.Index(html, "data:image/png")
	if cases < 0 || cases > plot {
		t.Error("the page does not show cases.csv before the plots")
	}
	for _, want := range []string{"--replay CASE/TRIAL", Caution, "<details><summary><b>sweep.json</b>"} {
		if !strings.Contains(html, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
}
