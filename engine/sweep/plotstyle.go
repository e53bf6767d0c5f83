package sweep

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	vgdraw "gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"clatter/engine/report"
	"clatter/engine/view"
)

// seriesColour is the colour of the i-th series: the Okabe-Ito palette
// (see view.OkabeIto), which readers with the common colour-vision
// deficiencies can tell apart, in an order that puts its pale yellow,
// hard to see on white, last.
func seriesColour(i int) color.Color {
	order := [...]int{5, 1, 3, 6, 2, 7, 0, 4}
	return view.OkabeIto[order[i%len(order)]]
}

// faceName names face f of body b by its outward normal in the body's
// own axes: "+x" ... "-z" along an axis, the normal's components
// otherwise, and a round face by its axis.
func faceName(m *Meta, b, f int) string {
	if f < 0 {
		return "no face"
	}
	name := fmt.Sprintf("face %d", f)
	if b >= len(m.Bodies) || f >= len(m.Bodies[b].Faces) {
		return name
	}
	faces := m.Bodies[b].Faces
	dirs := []string{faceDirection(faces[f])}
	if m.GroupFaces {
		// The faces counted with it, equal by symmetry.
		for i, o := range faces {
			if i != f && o.Group == faces[f].Group {
				dirs = append(dirs, faceDirection(o))
			}
		}
	}
	switch {
	case dirs[0] == "":
		return name
	case len(dirs) > 3:
		return fmt.Sprintf("%s (%s and %d alike)", name, dirs[0], len(dirs)-1)
	}
	return name + " (" + strings.Join(dirs, "; ") + ")"
}

// faceDirection is a face's outward normal, or a round face's axis.
func faceDirection(fm FaceMeta) string {
	switch {
	case fm.Normal != nil:
		return direction(*fm.Normal)
	case fm.Axis != nil:
		return "round, axis " + direction(*fm.Axis)
	}
	return ""
}

// axisTol is how close a unit normal's component must be to 1 to be
// named as an axis: normals are written with 12 significant digits.
const axisTol = 1e-9

func direction(n [3]float64) string {
	for i, a := range [3]string{"x", "y", "z"} {
		switch {
		case math.Abs(n[i]-1) < axisTol:
			return "+" + a
		case math.Abs(n[i]+1) < axisTol:
			return "-" + a
		}
	}
	return fmt.Sprintf("%.2f, %.2f, %.2f", n[0], n[1], n[2])
}

// keyUnit is the axis title of a varied key: the key and, where its last
// part says what quantity it is, its unit in the scene's units.
func keyUnit(key string, u report.Units) string {
	parts := strings.Split(key, ".")
	last := parts[len(parts)-1]
	if len(parts) > 1 && strings.Trim(last, "0123456789") == "" {
		last = parts[len(parts)-2] // a component of a vector
	}
	unit := ""
	switch last {
	case "friction", "static_friction", "restitution", "rolling_friction":
		unit = "no unit"
	case "step", "duration", "time", "at", "period", "delay":
		unit = "s"
	case "position", "size", "radius", "height", "length", "amplitude", "box", "cylinder", "capsule", "sphere", "offset":
		unit = u.Length
	case "mass":
		unit = u.Mass
	case "velocity", "speed":
		unit = u.Length + "/s"
	case "spin":
		unit = "rad/s"
	case "angle", "tilt":
		unit = "deg"
	case "frequency":
		unit = "Hz"
	case "density":
		unit = u.Mass + "/" + u.Length + "^3"
	case "number":
		if key == "drop.number" {
			return "drop number in the ten-drop sequence (drops.csv names its strike)"
		}
		return key + " (in the scene's units)"
	default:
		return key + " (in the scene's units)"
	}
	return key + " (" + unit + ")"
}

// quasiStaticLine draws a face's quasi-static probability as a dashed
// line in its colour across the plot.
func quasiStaticLine(p *plot.Plot, x0, x1, prob float64, col color.Color) error {
	l, err := plotter.NewLine(plotter.XYs{{X: x0, Y: prob}, {X: x1, Y: prob}})
	if err != nil {
		return err
	}
	l.Color = col
	l.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	l.Width = vg.Points(1)
	p.Add(l)
	return nil
}

// dashedKey is the legend entry that says what the dashed lines are.
func dashedKey(p *plot.Plot) {
	l, _ := plotter.NewLine(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}})
	l.Color = color.Gray{Y: 90}
	l.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	p.Legend.Add("dashed: quasi-static", l)
	p.Legend.Add("probability of the face", noThumb{})
}

type noThumb struct{}

func (noThumb) Thumbnail(*vgdraw.Canvas) {}

// notePlot is a frame-less figure that says in words why there is nothing
// to plot, in place of an empty frame.
func notePlot(title, note string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.HideAxes()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 1, 0, 1
	lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: 0.5, Y: 0.5}}, Labels: []string{note}})
	if err == nil {
		lb.TextStyle[0].XAlign = vgdraw.XCenter
		lb.TextStyle[0].YAlign = vgdraw.YCenter
		lb.TextStyle[0].Font.Size = vg.Points(14)
		p.Add(lb)
	}
	return p
}

// wrapTitle breaks a title too wide for the room at the separator (", ",
// "; " or " (") nearest its middle, so that no part of it is cut off.
func wrapTitle(t string, width func(string) vg.Length, room vg.Length) string {
	if width(t) <= room*0.95 || strings.Contains(t, "\n") {
		return t
	}
	best := -1
	for _, sep := range []string{"; ", ", ", " ("} {
		for i := strings.Index(t, sep); i >= 0; {
			if best < 0 || abs(i-len(t)/2) < abs(best-len(t)/2) {
				best = i
			}
			j := strings.Index(t[i+1:], sep)
			if j < 0 {
				break
			}
			i += 1 + j
		}
	}
	if best < 0 {
		return t
	}
	if t[best] == ' ' {
		return t[:best] + "\n" + t[best+1:]
	}
	return t[:best+1] + "\n" + t[best+2:]
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// legendGap is the space between the data and a legend beside it.
var legendGap = vg.Points(10)

// renderPNG draws a plot with its legend beside the data, to the right,
// rather than over it, and returns the PNG.
func renderPNG(p *plot.Plot) ([]byte, error) {
	img := vgimg.New(plotWidth, plotHeight)
	// A margin above the title, which gonum/plot sets at the very edge.
	dc := vgdraw.Crop(vgdraw.New(img), 0, 0, 0, -vg.Points(6))
	leg := p.Legend
	p.Legend = plot.NewLegend()
	r := leg.Rectangle(dc)
	w := r.Max.X - r.Min.X
	room := plotWidth
	if w > 0 {
		room -= w + 2*legendGap
	}
	p.Title.Text = wrapTitle(p.Title.Text, func(s string) vg.Length { return p.Title.TextStyle.Width(s) }, room)
	if w > 0 {
		// The plot's own right margin keeps its last tick label inside.
		p.Draw(vgdraw.Crop(dc, 0, -(w + 2*legendGap), 0, 0))
		leg.Top, leg.Left = true, true
		title := p.Title.TextStyle.Rectangle(p.Title.Text).Max.Y + p.Title.Padding
		leg.Draw(vgdraw.Crop(dc, plotWidth-w-legendGap, 0, 0, -(title + legendGap)))
	} else {
		p.Draw(dc)
	}
	p.Legend = leg
	var buf bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: img}).WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
