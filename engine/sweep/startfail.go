package sweep

import (
	"strconv"

	"clatter/engine"
	"clatter/engine/scene"
)

// startFailure is the result of trial g when its random start put one body
// inside another: the trial cannot run, so it fails like a trial whose
// simulation failed (failures.csv says why, the study goes on and ends
// with failed trials), instead of ending the whole study. Its rows in
// trials.csv have the case, trial, seed and body and settled = false, with
// the pose, impact and face columns empty: there is no state to report.
func (wk *worker) startFailure(g, c, t int64, seed uint64, sc *scene.Scene, oe *engine.OverlapError) result {
	var b []byte
	prefix := func(b []byte) []byte {
		b = strconv.AppendInt(b, c, 10)
		b = append(b, ',')
		b = strconv.AppendInt(b, t, 10)
		b = append(b, ',')
		b = strconv.AppendUint(b, seed, 10)
		return append(b, ',')
	}
	for _, i := range wk.st.dyn {
		b = prefix(b)
		b = append(b, wk.values...)
		b = append(b, csvField(sc.Bodies[i].Name)...)
		// face, settled, settled at, x, y, z, qw, qx, qy, qz, largest
		// impact, face down.
		b = append(b, ",,false,,,,,,,,,,\n"...)
	}
	f := prefix(nil)
	f = append(f, csvField("the random start of the trial is not possible: "+oe.Error())...)
	return result{g: g, rows: b, failure: append(f, '\n')}
}
