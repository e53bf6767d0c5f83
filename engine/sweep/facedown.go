package sweep

import (
	"fmt"
	"strconv"

	"clatter/engine/report"
)

// FaceDownFile counts, like cases.csv counts resting faces, the face that
// faced gravity at the end of each trial, settled or not: how the parts
// lie on a feeder that never lets them rest.
const FaceDownFile = "face-down.csv"

func (m *Meta) faceDownHeader() string {
	return "case," + m.keysHeader() + "body,face_down,count,trials,fraction,low,high"
}

// addDown counts a trial's face_down of body b in case c.
func (s *stats) addDown(c int64, b int, t int64, v string) error {
	if s.down == nil {
		s.down = make([][]int64, len(s.counts))
	}
	face := -1
	if v != "" {
		i, err := strconv.Atoi(v)
		if err != nil || i < 0 {
			return fmt.Errorf("case %d trial %d: face_down %q is not a face index", c, t, v)
		}
		face = s.group(b, i)
	}
	count(&s.down[c*int64(len(s.meta.Bodies))+int64(b)], face)
	return nil
}

// downRows makes the rows of face-down.csv: per case that has trials, per
// body, per face that some trial ended with facing down.
func (s *stats) downRows() []CaseRow {
	nb := len(s.meta.Bodies)
	var out []CaseRow
	for c := int64(0); c < s.meta.Cases && s.down != nil; c++ {
		n := s.trials[c]
		if n == 0 {
			continue
		}
		vals := s.values(c)
		for b := 0; b < nb; b++ {
			counts := s.down[c*int64(nb)+int64(b)]
			for slot := 1; slot <= len(counts); slot++ {
				i := slot % len(counts) // faces in order, then none (slot 0)
				k := counts[i]
				if k == 0 {
					continue
				}
				lo, hi := Wilson(k, n, Confidence)
				out = append(out, CaseRow{Case: c, Values: vals, Body: s.meta.Bodies[b].Name, Face: i - 1, Count: k, Trials: n,
					Fraction: report.Tidy(float64(k) / float64(n)), Low: report.Tidy(lo), High: report.Tidy(hi), QuasiStatic: s.quasiStatic(b, i-1)})
			}
		}
	}
	return out
}
