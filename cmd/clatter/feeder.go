package main

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"

	"clatter/engine/report"
	"clatter/engine/scene"
	"clatter/engine/sweep"
)

// writeFeederFigures prints a run's vibration drives and gate counts.
func writeFeederFigures(w io.Writer, s *scene.Scene, sum *report.Summary) {
	speed := s.Units.Symbol(scene.Speed)
	for _, d := range sum.Drives {
		throw, conv := "- (gravity does not press on the track)", "- (no part on the track after the first second)"
		if d.ThrowNumber != nil {
			throw = fmt.Sprintf("%.3g", *d.ThrowNumber)
		}
		if d.ConveyingSpeed != nil {
			conv = fmt.Sprintf("%.4g %s", *d.ConveyingSpeed, speed)
		}
		fmt.Fprintf(w, "drive    %s: throw number %s, conveying speed %s\n", d.Body, throw, conv)
	}
	if len(sum.Drives) > 0 {
		fmt.Fprintln(w, "         (throw number: the track's peak normal acceleration over g cos(track angle), common feeder-design")
		fmt.Fprintln(w, "         practice: below 1 the parts slide, above 1 they hop; conveying speed: mean along the track of the")
		fmt.Fprintf(w, "         parts touching it after %g s)\n", report.ConveyStart)
	}
	for _, g := range sum.Gates {
		noun := "crossings"
		if g.Count == 1 {
			noun = "crossing"
		}
		fmt.Fprintf(w, "gate     %s: %d %s, %.4g per minute%s\n", g.Name, g.Count, noun, g.Rate, faceCounts(g.Faces))
	}
	if len(sum.Drives)+len(sum.Gates) > 0 {
		fmt.Fprintln(w)
	}
}

// faceCounts writes the counts per face_down: "; face down 4: 7, 5: 3".
func faceCounts(m map[string]int64) string {
	if len(m) == 0 {
		return ""
	}
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if len(keys[i]) != len(keys[j]) {
			return len(keys[i]) < len(keys[j])
		}
		return keys[i] < keys[j]
	})
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = fmt.Sprintf("%s: %d", k, m[k])
	}
	return "; by face down " + strings.Join(parts, ", ")
}

// writeStudyFeeder prints a study's face_down counts (when parts did not
// settle), its gate counts and its orienting efficiencies.
func writeStudyFeeder(w io.Writer, res *sweep.Result) {
	m := res.Meta
	if res.Settled < m.TrialsDone && len(res.DownRows) > 0 {
		fmt.Fprintln(w, "face down at the end of the trials, settled or not:")
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, strings.Join(append(caseHead(m), "body", "face down", "count", "fraction", "95% interval", "quasi-static"), "\t"))
		for i, r := range res.DownRows {
			if i == maxTableRows {
				fmt.Fprintf(tw, "... and %d more rows in %s\n", len(res.DownRows)-i, sweep.FaceDownFile)
				break
			}
			cols := append(caseCols(r.Case, r.Values), r.Body, faceName(r.Face), fmt.Sprintf("%d/%d", r.Count, r.Trials),
				fmt.Sprintf("%.3f", r.Fraction), fmt.Sprintf("%.3f-%.3f", r.Low, r.High), probability(r.QuasiStatic))
			fmt.Fprintln(tw, strings.Join(cols, "\t"))
		}
		tw.Flush()
		fmt.Fprintln(w)
	}
	if len(res.GateRows) > 0 {
		fmt.Fprintln(w, "gates (fraction: of the crossings of that gate by that body; all: every moving body together):")
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, strings.Join(append(caseHead(m), "gate", "body", "face down", "count", "per minute", "fraction", "95% interval", "quasi-static"), "\t"))
		for i, r := range res.GateRows {
			if i == maxTableRows {
				fmt.Fprintf(tw, "... and %d more rows in %s\n", len(res.GateRows)-i, sweep.GateCasesFile)
				break
			}
			body := r.Body
			if body == "" {
				body = "all"
			}
			cols := append(caseCols(r.Case, r.Values), r.Gate, body, faceName(r.FaceDown), fmt.Sprint(r.Count), fmt.Sprintf("%.4g", r.Rate),
				fmt.Sprintf("%.3f", r.Fraction), fmt.Sprintf("%.3f-%.3f", r.Low, r.High), probability(r.QuasiStatic))
			fmt.Fprintln(tw, strings.Join(cols, "\t"))
		}
		tw.Flush()
		fmt.Fprintln(w)
	}
	for _, e := range res.Efficiencies {
		where := ""
		if len(m.Vary) > 0 {
			where = fmt.Sprintf(" (case %d)", e.Case)
		}
		fmt.Fprintf(w, "orienting efficiency at gate %s%s: %.3f, 95%% interval %.3f-%.3f: %d of %d parts fed crossed it with face down %s\n",
			e.Gate, where, e.Fraction, e.Low, e.High, e.Count, e.Fed, joinInts(e.Wanted))
	}
	if len(res.Efficiencies) > 0 {
		fmt.Fprintln(w, "(the share of the parts fed that the tooling delivers in the wanted orientation, as Boothroyd defines")
		fmt.Fprintln(w, "orienting efficiency in \"Assembly Automation and Product Design\", 2005)")
		fmt.Fprintln(w)
	}
}

func caseHead(m *sweep.Meta) []string {
	head := []string{"case"}
	for _, v := range m.Vary {
		head = append(head, v.Key)
	}
	return head
}

func caseCols(c int64, vals []float64) []string {
	cols := []string{fmt.Sprint(c)}
	for _, v := range vals {
		cols = append(cols, fmt.Sprintf("%g", v))
	}
	return cols
}

func faceName(f int) string {
	if f < 0 {
		return "none"
	}
	return fmt.Sprint(f)
}

func probability(p float64) string {
	if math.IsNaN(p) {
		return "-"
	}
	return fmt.Sprintf("%.3f", p)
}

func joinInts(a []int) string {
	s := make([]string, len(a))
	for i, x := range a {
		s[i] = fmt.Sprint(x)
	}
	return strings.Join(s, " or ")
}
