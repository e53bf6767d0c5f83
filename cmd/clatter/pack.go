package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"text/tabwriter"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/sweep"
)

// packNote is the caution every drop and tilt output keeps.
const packNote = "Caution: simulation informs the design of a package or a load; it does not replace the drop, vibration\n" +
	"and stability tests that the standards and carriers require."

// writePackTables writes, under a run's table, the drop's impacts and the
// bodies that tipped or slid; it reports whether it wrote anything.
func writePackTables(w io.Writer, s *scene.Scene, sum *report.Summary) bool {
	wrote := false
	if d := sum.Drop; d != nil {
		var balanced *string
		for _, b := range sum.Bodies {
			if b.Name == d.Body {
				balanced = b.Balanced
			}
		}
		writeDropTable(w, s, d, balanced)
		wrote = true
	}
	var moved []report.Body
	for _, b := range sum.Bodies {
		if b.TippedAt != nil || b.SlidAt != nil {
			moved = append(moved, b)
		}
	}
	if len(moved) > 0 {
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "body\ttipped (turned 2 deg on its support)\tslid (moved 1 mm along it)")
		for _, b := range moved {
			fmt.Fprintf(tw, "%s\t%s\t%s\n", b.Name, fmtMark(b.TippedAt), fmtMark(b.SlidAt))
		}
		tw.Flush()
		fmt.Fprintln(w, "the tilt is the support's turn from its starting pose when the motion began")
		fmt.Fprintln(w)
		wrote = true
	}
	if wrote {
		fmt.Fprintln(w, packNote)
		fmt.Fprintln(w)
	}
	return wrote
}

func fmtMark(m *report.TiltMark) string {
	if m == nil {
		return "no"
	}
	return fmt.Sprintf("at %.4g s, support tilted %.3g deg", m.Time, m.Tilt)
}

// writeDropTable writes the drop's report; balanced is the dropped body's
// summary entry of that name ("edge", "corner" or nil).
func writeDropTable(w io.Writer, s *scene.Scene, d *report.Drop, balanced *string) {
	speed := s.Units.Symbol(scene.Speed)
	how := ""
	if s.Drop != nil && s.Drop.ByMass {
		how = " (by mass: the ISTA 1A table)"
	}
	fmt.Fprintf(w, "drop     %s on %s from %.5g %s%s\n", d.Body, d.Strike, d.Height, s.Units.Length, how)
	fmt.Fprintf(w, "impact   %.5g %s at first contact\n", d.ImpactSpeed, speed)
	second := "none"
	if d.SecondaryImpactSpeed != nil {
		second = fmt.Sprintf("%s at %.5g %s", *d.SecondFeature, *d.SecondaryImpactSpeed, speed)
	}
	fmt.Fprintf(w, "second   %s\n", second)
	fmt.Fprintf(w, "spin     %.4g rad/s at most\n", spinShown(d.PeakSpin))
	if d.PeakAcceleration != nil { // compliant contacts only
		fmt.Fprintf(w, "peak     %.4g g (largest contact force over weight; the stiffness given decides it)\n", *d.PeakAcceleration)
	}
	final := "not on a face (still moving or leaning)"
	if balanced != nil {
		final = "not on a face: at rest balanced on " + map[string]string{"edge": "an edge", "corner": "a corner"}[*balanced]
	}
	if d.FinalFace != nil {
		final = fmt.Sprintf("face %d", *d.FinalFace)
		if d.TurnedOver {
			final += ", turned over"
		} else {
			final += ", the face it started over"
		}
	}
	fmt.Fprintf(w, "end      %s\n", final)
	const shown = 8
	if len(d.Impacts) > 0 {
		fmt.Fprintln(w)
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintf(tw, "impact\ttime (s)\tstruck\tnormal speed (%s)\timpulse (%s)\n", speed, s.Units.Symbol(scene.Impulse))
		for i, im := range d.Impacts {
			if i == shown {
				break
			}
			f := "-"
			if im.Feature != nil {
				f = *im.Feature
			}
			fmt.Fprintf(tw, "%d\t%.4f\t%s\t%.5g\t%.4g\n", i+1, im.Time, f, im.NormalSpeed, im.Impulse)
		}
		tw.Flush()
		if len(d.Impacts) > shown {
			fmt.Fprintf(w, "... %d impacts in all (summary.json lists them)\n", len(d.Impacts))
		}
	}
	fmt.Fprintln(w, "package faces here: 1 top, 2 right side, 3 bottom, 4 left side, 5 near end, 6 far end (ASTM D5276, ISTA);")
	fmt.Fprintln(w, "the body table's resting face and face down number faces as clatter inspect lists them")
	fmt.Fprintln(w)
}

// roundingSpin (rad/s) is below anything a drop resolves: a body struck
// through its centre of mass turns only by rounding.
const roundingSpin = 1e-9

// maxDropRows bounds the drops shown on stdout; drops.csv has them all.
const maxDropRows = 20

// writeDropsTable shows a drop study's drops.csv, if the folder has one,
// with the caution; it reports whether it did.
func writeDropsTable(w io.Writer, dir string, u report.Units) bool {
	f, err := os.Open(filepath.Join(dir, sweep.DropsFile))
	if err != nil {
		return false
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil || len(rows) < 2 {
		return false
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	get := func(r []string, k string) string {
		if v := r[col[k]]; v != "" {
			return v
		}
		return "-"
	}
	fmt.Fprintln(w, "drops (drops.csv): the struck feature and what struck next, in package face numbering")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	// The peak acceleration column appears for compliant drops only.
	peaks := false
	for _, r := range rows[1:] {
		if i, ok := col["peak_acceleration"]; ok && i < len(r) && r[i] != "" {
			peaks = true
		}
	}
	peakHead, peakOf := "", func([]string) string { return "" }
	if peaks {
		peakHead = "\tpeak (g)"
		peakOf = func(r []string) string { return fmt.Sprintf("\t%.4g", num(get(r, "peak_acceleration"))) }
	}
	fmt.Fprintf(tw, "case\ttrial\tstrike\theight (%s)\timpact speed (%s/s)\tsecond\tits speed\tpeak spin (rad/s)\tfinal face\tturned over%s\n", u.Length, u.Length, peakHead)
	for i, r := range rows[1:] {
		if i == maxDropRows {
			break
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%.5g\t%s\t%s\t%.3g\t%s\t%s%s\n", get(r, "case"), get(r, "trial"), get(r, "strike"), get(r, "height"),
			num(get(r, "impact_speed")), get(r, "second_feature"), get(r, "secondary_impact_speed"), spinShown(num(get(r, "peak_spin"))), get(r, "final_face"), get(r, "turned_over"), peakOf(r))
	}
	tw.Flush()
	if len(rows)-1 > maxDropRows {
		fmt.Fprintf(w, "... and %d more rows in drops.csv\n", len(rows)-1-maxDropRows)
	}
	fmt.Fprintln(w, "a rigid body struck on an edge or corner below its centre of mass bounces without turning and may rest")
	fmt.Fprintln(w, "balanced on it (final face -); a real package crushes and falls to a face")
	fmt.Fprintln(w)
	fmt.Fprintln(w, packNote)
	fmt.Fprintln(w)
	return true
}

// spinShown hides the rounding of a spin that is none.
func spinShown(w float64) float64 {
	if w < roundingSpin {
		return 0
	}
	return w
}

func num(s string) float64 {
	x, _ := strconv.ParseFloat(s, 64)
	return x
}
