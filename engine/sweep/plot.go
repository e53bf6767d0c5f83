package sweep

import (
	"fmt"
	"image/color"
	"math"
	"path/filepath"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	vgdraw "gonum.org/v1/plot/vg/draw"
)

// Plot size: a page-width figure that stays legible when shrunk.
const (
	plotWidth  = 7 * vg.Inch
	plotHeight = 4.5 * vg.Inch
	// maxPlotFaces is how many faces one plot shows (the most frequent):
	// beyond a handful the lines cannot be told apart.
	maxPlotFaces = 8
	// maxValueTicks: up to this many varied values each get a tick.
	maxValueTicks = 12
)

// writePlots writes the PNG plots of a finished folder and returns their
// names: for each moving body and varied key, the fraction of trials
// resting on each face against the key's values (trials pooled over the
// other keys) with 95 percent Wilson intervals; without varied keys, each
// body's face fractions; and the distribution of the times to settle.
func writePlots(dir string, m *Meta, st *stats, rows []CaseRow) ([]string, error) {
	var names []string
	used := map[string]bool{}
	save := func(p *plot.Plot, base string) error {
		name := base + ".png"
		for i := 2; used[name]; i++ {
			name = fmt.Sprintf("%s-%d.png", base, i)
		}
		used[name] = true
		png, err := renderPNG(p)
		if err != nil {
			return err
		}
		names = append(names, name)
		return writeAtomic(filepath.Join(dir, name), png)
	}
	nb := len(m.Bodies)
	for b := 0; b < nb; b++ {
		body := m.Bodies[b].Name
		faces := topFaces(rows, body, maxPlotFaces)
		if len(m.Vary) == 0 {
			p, err := facesBar(m, rows, b, faces)
			if err != nil {
				return nil, err
			}
			if err := save(p, "faces-"+fileSafe(body)); err != nil {
				return nil, err
			}
			continue
		}
		for k := range m.Vary {
			p, err := facesAgainst(m, st, rows, b, k, faces)
			if err != nil {
				return nil, err
			}
			if err := save(p, "faces-"+fileSafe(body)+"-"+fileSafe(m.Vary[k].Key)); err != nil {
				return nil, err
			}
		}
	}
	p, err := settleTimes(m, st)
	if err != nil {
		return nil, err
	}
	if err := save(p, "settle-times"); err != nil {
		return nil, err
	}
	return names, nil
}

// fileSafe keeps letters, digits, '.', '-' and '_' of a name for a file name.
func fileSafe(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r < 128 && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '.' || r == '-' || r == '_') {
			b.WriteRune(r)
		} else {
			b.WriteByte('_')
		}
	}
	return b.String()
}

// topFaces returns the faces of a body that some trial reached, in
// cases.csv order, cut to the n with the most trials over all cases (ties
// to the lower index).
func topFaces(rows []CaseRow, body string, n int) []int {
	total := map[int]int64{}
	var order []int
	for _, r := range rows {
		if r.Body != body {
			continue
		}
		if _, ok := total[r.Face]; !ok {
			order = append(order, r.Face)
		}
		total[r.Face] += r.Count
	}
	reached := order[:0:0]
	for _, f := range order {
		if total[f] > 0 {
			reached = append(reached, f)
		}
	}
	order = reached
	if len(order) <= n {
		return order
	}
	top := append([]int(nil), order...)
	sort.SliceStable(top, func(i, j int) bool { return total[top[i]] > total[top[j]] })
	keep := map[int]bool{}
	for _, f := range top[:n] {
		keep[f] = true
	}
	var out []int
	for _, f := range order {
		if keep[f] {
			out = append(out, f)
		}
	}
	return out
}

func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = x
	p.Y.Label.Text = y
	return p
}

func faceTitle(m *Meta, body string, shown, all int) string {
	t := fmt.Sprintf("%s: fraction of trials resting on each face", body)
	if shown < all {
		t += fmt.Sprintf(" (the %d most frequent)", shown)
	}
	if m.GroupFaces {
		t += "; symmetric faces grouped"
	}
	return t
}

// facesAgainst plots body b's face fractions against varied key k.
func facesAgainst(m *Meta, st *stats, rows []CaseRow, b, k int, faces []int) (*plot.Plot, error) {
	vary := m.Vary[k]
	nb := len(m.Bodies)
	allFaces := len(topFaces(rows, m.Bodies[b].Name, math.MaxInt))
	title := faceTitle(m, m.Bodies[b].Name, len(faces), allFaces)
	if note := noFaceNote(m, faces); note != "" {
		return notePlot(title, note), nil
	}
	qs := quasiStatic(rows, m.Bodies[b].Name)
	p := newPlot(title, keyUnit(vary.Key, m.Units), "fraction of trials (bars: 95% Wilson interval)")
	logX := vary.Log
	for _, x := range vary.Values {
		logX = logX && x > 0
	}
	if logX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	}
	if len(vary.Values) <= maxValueTicks {
		// Ticks at the values the study ran.
		ticks := make(plot.ConstantTicks, len(vary.Values))
		for i, x := range vary.Values {
			ticks[i] = plot.Tick{Value: x, Label: fmt.Sprintf("%g", x)}
		}
		p.X.Tick.Marker = ticks
	}
	stride := int64(1)
	for j := k + 1; j < len(m.Vary); j++ {
		stride *= int64(len(m.Vary[j].Values))
	}
	nv := int64(len(vary.Values))
	// Points of different faces at one value are set a little apart, so
	// that their interval bars do not hide each other.
	lo, hi := vary.Values[0], vary.Values[0]
	for _, x := range vary.Values {
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	dodge := func(x float64, i int) float64 {
		d := (float64(i) - float64(len(faces)-1)/2) * dodgeFraction
		if logX {
			if hi > lo {
				return x * math.Pow(hi/lo, d)
			}
			return x * math.Pow(2, d)
		}
		if hi > lo {
			return x + d*(hi-lo)
		}
		return x + d
	}
	// Room at the ends for the points set apart.
	switch {
	case logX && hi > lo:
		r := math.Pow(hi/lo, 0.05)
		p.X.Min, p.X.Max = lo/r, hi*r
	case hi > lo:
		p.X.Min, p.X.Max = lo-0.05*(hi-lo), hi+0.05*(hi-lo)
	}
	if p.X.Min == p.X.Max {
		p.X.Min, p.X.Max = lo-0.5, hi+0.5
	}
	// The drops of the ten-drop sequence are categories, not a scale:
	// their points are not joined.
	add := addSeries
	if vary.Key == "drop.number" {
		add = addPoints
	}
	top := 0.0
	dashed := false
	for i, f := range faces {
		pts := make(plotter.XYs, 0, nv)
		errs := make(plotter.YErrors, 0, nv)
		for j := int64(0); j < nv; j++ {
			var cnt, n int64
			for c := int64(0); c < m.Cases; c++ {
				if (c/stride)%nv != j || st.trials[c] == 0 {
					continue
				}
				n += st.trials[c]
				counts := st.counts[c*int64(nb)+int64(b)]
				if f+1 < len(counts) {
					cnt += counts[f+1]
				}
			}
			if n == 0 {
				continue
			}
			frac := float64(cnt) / float64(n)
			low, high := Wilson(cnt, n, Confidence)
			top = math.Max(top, high)
			pts = append(pts, plotter.XY{X: dodge(vary.Values[j], i), Y: frac})
			errs = append(errs, struct{ Low, High float64 }{frac - low, high - frac})
		}
		if len(pts) == 0 {
			continue
		}
		if err := add(p, pts, errs, faceName(m, b, f), i); err != nil {
			return nil, err
		}
		if q, ok := qs[f]; ok {
			if err := quasiStaticLine(p, p.X.Min, p.X.Max, q, seriesColour(i)); err != nil {
				return nil, err
			}
			top = math.Max(top, q)
			dashed = true
		}
	}
	if dashed {
		dashedKey(p)
	}
	p.Y.Min, p.Y.Max = 0, yTop(top, 0)
	return p, nil
}

// noFaceNote says why a plot of faces would be empty, or is "".
func noFaceNote(m *Meta, faces []int) string {
	if len(faces) == 0 {
		return "No trial has finished, so there is nothing to plot."
	}
	for _, f := range faces {
		if f >= 0 {
			return ""
		}
	}
	return fmt.Sprintf("No trial came to rest on a face within its %g s:\nevery one ended moving, leaning or round side down.", m.Duration)
}

// quasiStaticShift sets the quasi-static marker of a face beside its
// measured fraction, in units of the distance between faces.
const quasiStaticShift = 0.2

// quasiStatic maps a body's faces to their quasi-static probability.
func quasiStatic(rows []CaseRow, body string) map[int]float64 {
	out := map[int]float64{}
	for _, r := range rows {
		if r.Body == body && r.Face >= 0 && !math.IsNaN(r.QuasiStatic) {
			out[r.Face] = r.QuasiStatic
		}
	}
	return out
}

// dodgeFraction is the offset between the points of neighbouring faces,
// as a fraction of the x range (of its logarithm on a log axis).
const dodgeFraction = 0.008

// yTop is the top of a fraction axis whose highest interval bound is
// top: room above the data for a legend of n lines, at most 1.
func yTop(top float64, n int) float64 {
	return math.Min(1, top*(1+0.06*float64(n))+0.02)
}

// addSeries draws points joined by a line with their error bars.
func addSeries(p *plot.Plot, pts plotter.XYs, errs plotter.YErrors, label string, i int) error {
	l, sc, err := plotter.NewLinePoints(pts)
	if err != nil {
		return err
	}
	col := seriesColour(i)
	l.Color = col
	sc.Color = col
	sc.Shape = plotutil.Shape(i)
	eb, err := plotter.NewYErrorBars(struct {
		plotter.XYs
		plotter.YErrors
	}{pts, errs})
	if err != nil {
		return err
	}
	eb.LineStyle.Color = col
	p.Add(l, sc, eb)
	p.Legend.Add(label, l, sc)
	return nil
}

// facesBar plots a body's face fractions of a study without varied keys.
func facesBar(m *Meta, rows []CaseRow, b int, faces []int) (*plot.Plot, error) {
	body := m.Bodies[b].Name
	title := faceTitle(m, body, len(faces), len(topFaces(rows, body, math.MaxInt)))
	if note := noFaceNote(m, faces); note != "" {
		return notePlot(title, note), nil
	}
	p := newPlot(title, "resting face (outward normal in the body's axes)", "fraction of trials")
	var qpts plotter.XYs
	top := 0.0
	var pts plotter.XYs
	var errs plotter.YErrors
	var labels []string
	for _, f := range faces {
		for _, r := range rows {
			if r.Body == body && r.Face == f {
				pts = append(pts, plotter.XY{X: float64(len(labels)), Y: r.Fraction})
				errs = append(errs, struct{ Low, High float64 }{r.Fraction - r.Low, r.High - r.Fraction})
				labels = append(labels, faceName(m, b, f))
				top = math.Max(top, r.High)
				if !math.IsNaN(r.QuasiStatic) {
					qpts = append(qpts, plotter.XY{X: float64(len(labels)-1) + quasiStaticShift, Y: r.QuasiStatic})
					top = math.Max(top, r.QuasiStatic)
				}
			}
		}
	}
	if len(pts) == 0 {
		return p, nil
	}
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, err
	}
	sc.Shape = vgdraw.CircleGlyph{}
	sc.Color = seriesColour(0)
	eb, err := plotter.NewYErrorBars(struct {
		plotter.XYs
		plotter.YErrors
	}{pts, errs})
	if err != nil {
		return nil, err
	}
	eb.LineStyle.Color = seriesColour(0)
	p.Add(sc, eb)
	p.Legend.Add("fraction of trials", sc)
	p.Legend.Add("and its 95% Wilson interval", noThumb{})
	if len(qpts) > 0 {
		q, err := plotter.NewScatter(qpts)
		if err != nil {
			return nil, err
		}
		q.Shape = vgdraw.PyramidGlyph{}
		q.Color = seriesColour(1)
		q.Radius = vg.Points(4)
		p.Add(q)
		p.Legend.Add("quasi-static probability", q)
	}
	p.NominalX(labels...)
	p.Y.Min, p.Y.Max = 0, yTop(top, 0)
	return p, nil
}

// maxSettleLines is the most cases drawn as lines of their own in the
// settle-time plot; more are pooled into one histogram.
const maxSettleLines = 6

// settleTimes plots the distribution of the times trials took to settle,
// over the times that occur.
func settleTimes(m *Meta, st *stats) (*plot.Plot, error) {
	fine := m.Duration / settleBins
	top := m.Duration
	if st.settledAll > 0 {
		top = math.Min(m.Duration, niceCeil(st.settleMax+fine))
	}
	per := max(1, int(math.Round(top/plotBins/fine)))
	width := float64(per) * fine
	nbins := min(int(math.Ceil(top/width-1e-9)), (settleBins+per-1)/per)
	join := func(h []int64, j int) float64 {
		var n int64
		for i := j * per; i < min((j+1)*per, settleBins); i++ {
			n += h[i]
		}
		return float64(n)
	}
	var cases []int64
	for c := int64(0); c < m.Cases; c++ {
		if st.trials[c] > 0 {
			cases = append(cases, c)
		}
	}
	title := fmt.Sprintf("time to settle: %d of %d trials settled", st.settledAll, sum(st.trials))
	if st.settledAll == 0 {
		return notePlot(title, fmt.Sprintf("No trial settled within its %g s: there are no times to plot.", m.Duration)), nil
	}
	if st.hist != nil && len(cases) > 1 {
		p := newPlot(title, "time to settle (s)", "fraction of the case's trials")
		for i, c := range cases {
			pts := make(plotter.XYs, 0, 2*nbins)
			for j := 0; j < nbins; j++ {
				y := join(st.hist[c], j) / float64(st.trials[c])
				pts = append(pts, plotter.XY{X: float64(j) * width, Y: y}, plotter.XY{X: float64(j+1) * width, Y: y})
			}
			l, err := plotter.NewLine(pts)
			if err != nil {
				return nil, err
			}
			l.Color = seriesColour(i)
			l.Width = vg.Points(1.5)
			p.Add(l)
			p.Legend.Add(caseLabel(m, st, c), l)
		}
		p.X.Min, p.X.Max = 0, float64(nbins)*width
		p.Y.Min = 0
		return p, nil
	}
	p := newPlot(title, "time to settle (s)", "trials")
	bins := make([]plotter.HistogramBin, nbins)
	for j := range bins {
		bins[j] = plotter.HistogramBin{Min: float64(j) * width, Max: float64(j+1) * width, Weight: join(st.pooled, j)}
	}
	h := &plotter.Histogram{Bins: bins, Width: width, FillColor: color.Gray{Y: 180}}
	h.LineStyle.Width = vg.Points(0.5)
	h.LineStyle.Color = color.Black
	p.Add(h)
	p.X.Min, p.X.Max = 0, float64(nbins)*width
	p.Y.Min = 0
	if st.settledAll == 0 {
		p.Y.Max = 1
	}
	return p, nil
}

// niceCeil rounds x > 0 up to 1, 2 or 5 times a power of ten.
func niceCeil(x float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= x*(1-1e-12) {
			return m * p
		}
	}
	return 10 * p
}

func caseLabel(m *Meta, st *stats, c int64) string {
	vals := st.values(c)
	parts := make([]string, len(vals))
	for k, v := range vals {
		parts[k] = fmt.Sprintf("%s = %g", m.Vary[k].Key, v)
	}
	return strings.Join(parts, ", ")
}

func sum(a []int64) int64 {
	var s int64
	for _, x := range a {
		s += x
	}
	return s
}
