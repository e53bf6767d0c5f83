package contact

import (
	"cmp"
	"slices"
)

// Memory is what warm starting remembers of one contact point between
// steps (its key, impulses and friction state). A caller that stops
// passing a point to Solve for a while, such as a world whose bodies fall
// asleep, keeps its Memory with Remembered and hands it back with Recall,
// so that the point resumes with the load it carried instead of from zero.
type Memory struct{ w warmPoint }

// Key is the key of the point the memory belongs to.
func (m Memory) Key() uint64 { return m.w.key }

// NormalImpulse is the normal impulse remembered (N s).
func (m Memory) NormalImpulse() float64 { return m.w.normal }

// Remembered returns the memory that the last Solve stored for its point i
// (an index into the points it was given). It is valid until the next Solve.
func (s *Solver) Remembered(i int) Memory { return Memory{s.prevPts[i]} }

// Recall adds memories to those the next Solve matches its points against;
// it sorts ms by key. A key the solver already remembers keeps its own
// entry. The memories go after last step's in prevPts, so that the entries
// of last step's points keep their places (patches.mem and prevPair index
// them). Recall allocates only while the solver's buffers grow.
func (s *Solver) Recall(ms []Memory) {
	if len(ms) == 0 {
		return
	}
	slices.SortFunc(ms, func(a, b Memory) int { return cmp.Compare(a.w.key, b.w.key) })
	// Merge the new keys into the key index, by way of keyTmp, which is
	// free between Solves.
	prev, add := s.prevKeys, ms
	out := s.keyTmp[:0]
	i, j := 0, 0
	for i < len(prev) || j < len(add) {
		switch {
		case j == len(add) || (i < len(prev) && prev[i].key <= add[j].w.key):
			if j < len(add) && prev[i].key == add[j].w.key {
				j++ // the solver's own entry wins
			}
			out = append(out, prev[i])
			i++
		default:
			if len(out) == 0 || out[len(out)-1].key != add[j].w.key {
				out = append(out, keyIndex{add[j].w.key, int32(len(s.prevPts))})
				s.prevPts = append(s.prevPts, add[j].w)
			}
			j++
		}
	}
	s.prevKeys, s.keyTmp = out, prev[:0]
}
