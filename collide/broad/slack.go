package broad

import (
	"math"
	"slices"

	"clatter/shapes"
)

// Boxes with slack: the pairs of a resting scene are the same step after
// step, and sweeping for them again costs a pass over every box and every
// box it overlaps along the sweep axis. With a slack d (SetSlack), the sweep
// works on each body's box enlarged by d, renewed only when the body's box
// leaves it (the enlarged, or "fat", bounding volumes of Ericson,
// "Real-Time Collision Detection", 2005, ch. 6, and van den Bergen,
// "Collision Detection in Interactive 3D Environments", 2003, on exploiting
// coherence with loose bounds; from memory, no section given). The pairs of
// the enlarged boxes are kept: when no enlarged box changed since the last
// call, they are still the pairs of the enlarged boxes, and when a few did,
// only those few bodies are tested again, each against every box. The
// pairs reported are the kept pairs whose own boxes overlap: a body's box
// lies in its enlarged one, so two overlapping boxes always make a kept
// pair, and the result is exactly the pairs the sweep of the boxes
// themselves finds, in the same order, whatever the slack.

// slackState is the SAP's memory of enlarged boxes and their pairs.
type slackState struct {
	d     float64       // the slack; 0: the sweep uses the boxes themselves
	fat   []shapes.AABB // by id: the enlarged box the sweep and the kept pairs use
	moved []int32       // ids whose enlarged box was renewed since the last Pairs
	kept  [][2]int32    // the pairs of the enlarged boxes at the last Pairs, sorted
	ok    bool          // kept holds them, and no body came, went or changed its rule since
	add   [][2]int32    // scratch: the moved bodies' new pairs
	next  [][2]int32    // scratch: the merge of kept and add
}

// movedShare is the largest fraction of the bodies whose enlarged boxes may
// have been renewed for the kept pairs to be updated body by body: each
// such body is tested against every box, and the full sweep costs about
// as much as thirty-odd of those tests once the pairs are sorted.
const movedShare = 1.0 / 32

// SetSlack sets the slack d (same units as the boxes) by which the sweep
// enlarges each box (slack.go): the pairs reported are the same for any
// slack, and a larger one lets more steps reuse the last step's pairs at
// the cost of more pairs to filter. 0, the default, sweeps the boxes
// themselves; a negative, NaN or infinite d counts as 0.
func (s *SAP) SetSlack(d float64) {
	if !(d > 0) || math.IsInf(d, 0) {
		d = 0
	}
	s.slack.d, s.slack.ok = d, false
	for id := range s.slack.fat {
		s.slack.fat[id] = s.enlarge(s.slots[id].box)
	}
}

// enlarge returns box grown by the slack (an infinite side stays infinite).
func (s *SAP) enlarge(box shapes.AABB) shapes.AABB {
	if s.slack.d == 0 {
		return box
	}
	return box.Grow(s.slack.d)
}

// setFat records body id's box at Insert or Move: its enlarged box is
// renewed when the box has left it.
func (s *SAP) setFat(id int32, box shapes.AABB, insert bool) {
	ss := &s.slack
	if int(id) >= len(ss.fat) {
		ss.fat = slices.Grow(ss.fat, int(id)+1-len(ss.fat))[:id+1]
	}
	f := &ss.fat[id]
	if insert {
		*f = s.enlarge(box)
		ss.ok = false
		return
	}
	if within(box, f) {
		return
	}
	*f = s.enlarge(box)
	if ss.ok && s.slots[id].flags&fMoved == 0 {
		s.slots[id].flags |= fMoved
		ss.moved = append(ss.moved, id)
	}
}

// within reports whether box b lies in box f.
func within(b shapes.AABB, f *shapes.AABB) bool {
	return b.Min[0] >= f.Min[0] && b.Min[1] >= f.Min[1] && b.Min[2] >= f.Min[2] &&
		b.Max[0] <= f.Max[0] && b.Max[1] <= f.Max[1] && b.Max[2] <= f.Max[2]
}

// forget drops the kept pairs: a body came or went, or the reporting rule
// of one changed (asleep, filter).
func (s *SAP) forget() { s.slack.ok = false }

// reusable reports whether Pairs may update the kept pairs instead of
// sweeping: nothing but the enlarged boxes of a few awake bodies changed.
func (s *SAP) reusable() bool {
	ss := &s.slack
	if !ss.ok || s.purge || s.still.reclass || s.still.dirty || len(s.pend) > 0 {
		return false
	}
	return float64(len(ss.moved)) <= movedShare*float64(s.live)
}

// reusePairs updates the kept pairs for the bodies whose enlarged boxes
// were renewed and appends to dst those whose own boxes overlap.
func (s *SAP) reusePairs(dst [][2]int32) [][2]int32 {
	ss := &s.slack
	if len(ss.moved) > 0 {
		ss.add = s.movedPairs(ss.add[:0])
		s.sortPairs(ss.add)
		w := 0
		for _, pr := range ss.kept {
			if (s.slots[pr[0]].flags|s.slots[pr[1]].flags)&fMoved == 0 {
				ss.kept[w] = pr
				w++
			}
		}
		ss.next = MergePairs(ss.next[:0], ss.kept[:w], ss.add)
		ss.kept, ss.next = ss.next, ss.kept
		s.clearMoved()
	}
	return s.tight(dst, ss.kept)
}

// movedPairs appends the pairs of the enlarged boxes of the moved bodies,
// each tested against every listed body; a pair of two moved bodies is
// found from the larger id.
func (s *SAP) movedPairs(dst [][2]int32) [][2]int32 {
	fat := s.slack.fat
	for _, m := range s.slack.moved {
		fm := &fat[m]
		for id := range s.slots {
			o := &s.slots[id]
			if o.flags&fListed == 0 || int32(id) == m || o.flags&fMoved != 0 && int32(id) > m {
				continue
			}
			if f := &fat[id]; f.Min[0] <= fm.Max[0] && fm.Min[0] <= f.Max[0] &&
				f.Min[1] <= fm.Max[1] && fm.Min[1] <= f.Max[1] &&
				f.Min[2] <= fm.Max[2] && fm.Min[2] <= f.Max[2] {
				dst = s.report(dst, m, int32(id))
			}
		}
	}
	return dst
}

// clearMoved empties the list of renewed enlarged boxes.
func (s *SAP) clearMoved() {
	for _, id := range s.slack.moved {
		s.slots[id].flags &^= fMoved
	}
	s.slack.moved = s.slack.moved[:0]
}

// keepPairs ends a sweep of the enlarged boxes, whose pairs are
// dst[start:]: it keeps them for the next call and leaves in dst[start:]
// those whose own boxes overlap.
func (s *SAP) keepPairs(dst [][2]int32, start int) [][2]int32 {
	ss := &s.slack
	s.clearMoved()
	if ss.d == 0 {
		return dst // the enlarged boxes are the boxes
	}
	ss.kept = append(ss.kept[:0], dst[start:]...)
	ss.ok = true
	return s.tight(dst[:start], ss.kept)
}

// tight appends to dst the pairs of ps whose own boxes overlap.
func (s *SAP) tight(dst, ps [][2]int32) [][2]int32 {
	for _, pr := range ps {
		a, b := &s.slots[pr[0]].box, &s.slots[pr[1]].box
		if a.Min[0] <= b.Max[0] && b.Min[0] <= a.Max[0] &&
			a.Min[1] <= b.Max[1] && b.Min[1] <= a.Max[1] &&
			a.Min[2] <= b.Max[2] && b.Min[2] <= a.Max[2] {
			dst = append(dst, pr)
		}
	}
	return dst
}

// MergePairs appends to dst the union of x and y, two lists of distinct
// pairs sorted by (first, second) with none in both, sorted the same way.
func MergePairs(dst, x, y [][2]int32) [][2]int32 {
	i, j := 0, 0
	for i < len(x) && j < len(y) {
		if cmpPair(x[i], y[j]) <= 0 {
			dst = append(dst, x[i])
			i++
		} else {
			dst = append(dst, y[j])
			j++
		}
	}
	dst = append(dst, x[i:]...)
	return append(dst, y[j:]...)
}
