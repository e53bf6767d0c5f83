package main

import (
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"clatter/engine/view/viewtest"
)

// TestReplayMatchesTrials replays trials of the example study, whose every
// trial draws its orientation, position, height and spin, and checks that
// each ends in the state of its row of trials.csv, to the last digit
// written (both files hold 12 significant digits of the same numbers).
func TestReplayMatchesTrials(t *testing.T) {
	ref := reference(t)
	rows := readTrials(t, filepath.Join(ref, "trials.csv"))
	for _, trial := range []string{"0/0", "0/41", "1/5", "2/17", "2/59"} {
		t.Run(trial, func(t *testing.T) {
			row, ok := rows[trial]
			if !ok {
				t.Fatalf("trials.csv has no row %s", trial)
			}
			dir := t.TempDir()
			_, errs, code := clatter(t, "sweep", exampleSweep, "--replay", trial, "-o", dir, "--quiet")
			if code != exitOK {
				t.Fatalf("exit %d\n%s", code, errs)
			}
			var sum struct {
				SettledAt *float64 `json:"settled_at"`
				Bodies    []struct {
					Position       [3]float64 `json:"position"`
					Orientation    [4]float64 `json:"orientation"`
					RestingFace    *int       `json:"resting_face"`
					MaxImpactSpeed float64    `json:"max_impact_speed"`
				} `json:"bodies"`
			}
			readJSON(t, filepath.Join(dir, "summary.json"), &sum)
			b := sum.Bodies[0]
			g := func(x float64) string { return strconv.FormatFloat(x, 'g', 12, 64) }
			got := map[string]string{"x": g(b.Position[0]), "y": g(b.Position[1]), "z": g(b.Position[2]),
				"qw": g(b.Orientation[0]), "qx": g(b.Orientation[1]), "qy": g(b.Orientation[2]), "qz": g(b.Orientation[3]),
				"max_impact_speed": g(b.MaxImpactSpeed), "resting_face": "", "settled_at": ""}
			if b.RestingFace != nil {
				got["resting_face"] = strconv.Itoa(*b.RestingFace)
			}
			if sum.SettledAt != nil {
				got["settled_at"] = g(*sum.SettledAt)
			}
			for k, v := range got {
				if row[k] != v {
					t.Errorf("%s: the replay ends with %s, trials.csv has %s", k, v, row[k])
				}
			}
		})
	}
}

// readTrials reads trials.csv into its rows by "case/trial".
func readTrials(t *testing.T, path string) map[string]map[string]string {
	recs := readCSV(t, path)
	out := map[string]map[string]string{}
	for _, r := range recs[1:] {
		m := map[string]string{}
		for i, h := range recs[0] {
			m[h] = r[i]
		}
		out[m["case"]+"/"+m["trial"]] = m
	}
	return out
}

// TestReplayVisuals replays a trial with its animation and pictures and
// checks the animation with the Khronos glTF validator.
func TestReplayVisuals(t *testing.T) {
	dir := t.TempDir()
	_, errs, code := clatter(t, "sweep", exampleSweep, "--replay", "2/3", "-o", dir, "--animation", "--pictures", "--quiet")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, errs)
	}
	for _, f := range []string{"start.png", "end.png"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s not written: %v", f, err)
		}
	}
	if is := viewtest.Validate(t, filepath.Join(dir, "animation.glb")); is.NumErrors != 0 {
		t.Errorf("the glTF validator found %s", is)
	}
}

// TestReplayBadInput checks that a replay of a trial the study does not
// have, or written wrongly, is refused as bad input.
func TestReplayBadInput(t *testing.T) {
	for _, arg := range []string{"3/0", "0/60", "1", "a/b", "-1/2"} {
		_, errs, code := clatter(t, "sweep", exampleSweep, "--replay", arg, "-o", t.TempDir())
		if code != exitBad {
			t.Errorf("--replay %s: exit %d, want %d\n%s", arg, code, exitBad, errs)
		}
	}
	for _, extra := range []string{"--resume", "--shard=1/2"} {
		if _, _, code := clatter(t, "sweep", exampleSweep, "--replay", "0/1", extra, "-o", t.TempDir()); code != exitBad {
			t.Errorf("--replay with %s: exit %d, want %d", extra, code, exitBad)
		}
	}
	_, _, code := clatter(t, "sweep", exampleSweep, "--pictures", "-o", t.TempDir())
	if code != exitBad {
		t.Errorf("sweep --pictures without --replay: exit %d, want %d", code, exitBad)
	}
}
