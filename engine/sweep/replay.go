package sweep

import (
	"strconv"
	"strings"

	"clatter/engine/scene"
)

// ParseTrial reads a trial's address, "CASE/TRIAL", both counted from 0
// as in trials.csv.
func ParseTrial(s string) (c, t int64, err error) {
	cs, ts, ok := strings.Cut(s, "/")
	if ok {
		c, err = strconv.ParseInt(strings.TrimSpace(cs), 10, 64)
		if err == nil {
			t, err = strconv.ParseInt(strings.TrimSpace(ts), 10, 64)
		}
	}
	if !ok || err != nil || c < 0 || t < 0 {
		return 0, 0, badf("%q is not a trial: write CASE/TRIAL, the case and trial columns of trials.csv, e.g. 0/3", s)
	}
	return c, t, nil
}

// TrialScene returns the scene of trial t of case c as the study runs it:
// the case's varied keys set and the trial's random draws made. Run with
// report.Run, its final state is the trial's row of trials.csv.
func (st *Study) TrialScene(c, t int64) (*scene.Scene, error) {
	if c >= st.meta.Cases || t >= st.meta.Trials {
		return nil, badf("the study has cases 0 to %d and trials 0 to %d of each; there is no trial %d/%d", st.meta.Cases-1, st.meta.Trials-1, c, t)
	}
	cs, err := st.caseScene(c)
	if err != nil {
		return nil, err
	}
	sc := *cs
	sc.Bodies = append([]scene.Body(nil), cs.Bodies...)
	st.drawStart(trialRand(TrialSeed(st.meta.Seed, c, t)), &sc)
	return &sc, nil
}

// Describe names the varied values of case c, as messages do:
// "material.abs.friction = 0.2".
func (st *Study) Describe(c int64) string { return st.describe(c) }
