package main

import (
	"flag"

	"clatter/engine/sweep"
)

// replayTrial runs one trial of a study as run would.
func replayTrial(e *env, pos []string, trial, dir, sampleText string, vis *visuals) int {
	if len(pos) != 1 {
		e.errorf("sweep: give one scene file, e.g. clatter sweep testdata/sweeps/cube.toml --replay 0/3 (got %d arguments)", len(pos))
		return exitBad
	}
	sample, err := parseSeconds(sampleText)
	if err != nil {
		e.errorf("sweep: --sample: %v", err)
		return exitBad
	}
	c, t, err := sweep.ParseTrial(trial)
	if err != nil {
		return sweepFailed(e, err, dir)
	}
	st, ok := openStudy(e, pos[0])
	if !ok {
		return exitBad
	}
	s, err := st.TrialScene(c, t)
	if err != nil {
		return sweepFailed(e, err, dir)
	}
	e.infof("replaying case %d (%s), trial %d of %s", c, st.Describe(c), t, pos[0])
	return simulate(e, s, dir, sample, false, vis)
}

// flagGiven tells whether a flag was set on the command line.
func flagGiven(fs *flag.FlagSet, name string) bool {
	given := false
	fs.Visit(func(f *flag.Flag) { given = given || f.Name == name })
	return given
}
