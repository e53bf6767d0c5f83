package sweep

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	vgdraw "gonum.org/v1/plot/vg/draw"
)

// writeGatePlots writes gate-<name>.png for each gate: per face down, the
// share of the gate's crossings (every moving body together when there
// are several) with its 95 percent Wilson interval, a series per case (the
// first maxSettleLines cases), the crossings per minute in the legend
// beside the data, and the faces' quasi-static probabilities beside them.
func writeGatePlots(dir string, m *Meta, rows []GateRow) ([]string, error) {
	var names []string
	body, bi := "", len(m.Bodies) // bi past the bodies: faces named by number only
	if len(m.Bodies) == 1 {
		body, bi = m.Bodies[0].Name, 0
	}
	for _, g := range m.Gates {
		var faces []int
		seen := map[int]bool{}
		for _, r := range rows {
			if r.Gate == g.Name && r.Body == body && !seen[r.FaceDown] {
				seen[r.FaceDown] = true
				faces = append(faces, r.FaceDown)
			}
		}
		if len(faces) == 0 {
			continue
		}
		slices.Sort(faces)
		slot := map[int]int{}
		labels := make([]string, len(faces))
		for i, f := range faces {
			slot[f] = i
			labels[i] = faceName(m, bi, f)
		}
		who := ""
		if body == "" {
			who = ", every moving body together"
		}
		p := newPlot(fmt.Sprintf("gate %s: its crossings by face down (95%% Wilson intervals%s)", g.Name, who), "face down", "fraction of crossings")
		cases := map[int64][]GateRow{}
		var order []int64
		for _, r := range rows {
			if r.Gate != g.Name || r.Body != body {
				continue
			}
			if _, ok := cases[r.Case]; !ok {
				order = append(order, r.Case)
			}
			cases[r.Case] = append(cases[r.Case], r)
		}
		if len(order) > maxSettleLines {
			order = order[:maxSettleLines]
		}
		top := 0.0
		qs := map[int]float64{}
		// Cases side by side within each face's slot, the quasi-static
		// marker beside the last of them.
		const caseGap = 0.12
		half := float64(len(order)-1) / 2 * caseGap
		for k, c := range order {
			var pts plotter.XYs
			var errs plotter.YErrors
			rate := 0.0
			off := float64(k)*caseGap - half
			for _, r := range cases[c] {
				pts = append(pts, plotter.XY{X: float64(slot[r.FaceDown]) + off, Y: r.Fraction})
				errs = append(errs, struct{ Low, High float64 }{r.Fraction - r.Low, r.High - r.Fraction})
				rate += r.Rate
				top = math.Max(top, r.High)
				if !math.IsNaN(r.QuasiStatic) {
					qs[r.FaceDown] = r.QuasiStatic
				}
			}
			label := fmt.Sprintf("%.3g crossings per minute", rate)
			if len(m.Vary) > 0 {
				label = fmt.Sprintf("%s: %.3g per minute", valuesLabel(m, cases[c][0].Values), rate)
			}
			if err := addPoints(p, pts, errs, label, k); err != nil {
				return nil, err
			}
		}
		if len(qs) > 0 {
			var pts plotter.XYs
			for _, f := range faces {
				if q, ok := qs[f]; ok {
					pts = append(pts, plotter.XY{X: float64(slot[f]) + half + quasiStaticShift, Y: q})
					top = math.Max(top, q)
				}
			}
			sc, err := plotter.NewScatter(pts)
			if err != nil {
				return nil, err
			}
			sc.Shape = vgdraw.PyramidGlyph{}
			sc.Radius = vg.Points(4)
			sc.Color = seriesColour(len(order))
			p.Add(sc)
			p.Legend.Add("quasi-static probability", sc)
		}
		p.NominalX(labels...)
		// Half a slot of room on either side, so that the first and last
		// faces' labels and markers stay inside the frame.
		p.X.Min, p.X.Max = -0.5, float64(len(faces))-0.5
		p.Y.Min, p.Y.Max = 0, yTop(top, 0)
		png, err := renderPNG(p)
		if err != nil {
			return nil, err
		}
		name := "gate-" + fileSafe(g.Name) + ".png"
		if err := writeAtomic(filepath.Join(dir, name), png); err != nil {
			return nil, err
		}
		names = append(names, name)
	}
	return names, nil
}

// addPoints draws points with their error bars, not joined, in the
// colour and shape of series i.
func addPoints(p *plot.Plot, pts plotter.XYs, errs plotter.YErrors, label string, i int) error {
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return err
	}
	sc.Color = seriesColour(i)
	sc.Shape = plotutil.Shape(i)
	eb, err := plotter.NewYErrorBars(struct {
		plotter.XYs
		plotter.YErrors
	}{pts, errs})
	if err != nil {
		return err
	}
	eb.LineStyle.Color = sc.Color
	p.Add(sc, eb)
	p.Legend.Add(label, sc)
	return nil
}

// valuesLabel names a case by its varied keys' values, each key by its
// last part, so that the legend leaves the data its room (the table and
// gate-cases.csv give the full keys).
func valuesLabel(m *Meta, vals []float64) string {
	parts := make([]string, 0, len(vals))
	for k, v := range vals {
		if k < len(m.Vary) {
			parts = append(parts, fmt.Sprintf("%s = %g", shortKey(m.Vary[k].Key), v))
		}
	}
	return strings.Join(parts, ", ")
}

// shortKey is the last part of a dotted key, with its parent for an
// element of a vector: "material.steel.friction" is "friction",
// "body.cube.position.2" is "position.2".
func shortKey(key string) string {
	parts := strings.Split(key, ".")
	n := 1
	if len(parts) > 1 && strings.Trim(parts[len(parts)-1], "0123456789") == "" {
		n = 2
	}
	return strings.Join(parts[len(parts)-n:], ".")
}
