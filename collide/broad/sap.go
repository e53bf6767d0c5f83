package broad

import (
	"errors"
	"fmt"
	"math"
	"math/bits"
	"slices"

	"clatter/shapes"
)

// Kind says how a body takes part in the broad phase.
type Kind uint8

const (
	// Dynamic bodies move; they are reported against every body their
	// filter admits while they are awake.
	Dynamic Kind = iota
	// Static bodies (fixtures, planes, static meshes) are never reported
	// against each other nor against sleeping bodies. They may still be
	// moved, for example by a scene edit.
	Static
)

func (k Kind) String() string {
	switch k {
	case Dynamic:
		return "dynamic"
	case Static:
		return "static"
	}
	return fmt.Sprintf("Kind(%d)", uint8(k))
}

// AllBits is the default category and mask: a body in every group that
// collides with every group.
const AllBits = ^uint32(0)

// MaxID is the largest body id accepted. Ids index flat slices, so they
// should be dense (the world's body index), not arbitrary keys.
const MaxID = 1<<24 - 1

// Errors returned by SAP, wrapped with the body id and what to do.
var (
	ErrBadID     = errors.New("body id out of range")
	ErrDuplicate = errors.New("body already present")
	ErrUnknown   = errors.New("no such body")
	ErrBadBox    = errors.New("invalid bounding box")
)

// axisSwitchRatio is the hysteresis of the axis choice: another axis takes
// over only when the variance of the box centres along it exceeds that of
// the current axis by this factor. The work of the sweep goes roughly with
// the inverse of the spread (standard deviation), so 1.44 means the new axis
// promises at least 20 percent less work; small enough to follow a scene
// that spreads out, large enough that an evenly spread scene does not flip
// axes (and re-sort) every step.
const axisSwitchRatio = 1.44

// Slot flags.
const (
	fLive    uint8 = 1 << iota // inserted and not removed
	fStatic                    // Kind == Static
	fAsleep                    // marked asleep by the caller
	fListed                    // has a proxy in SAP.p
	fPending                   // id is in SAP.pend, waiting to be listed
	fStill                     // its proxy is in SAP.still (static or asleep), not SAP.p
	fMoved                     // its enlarged box was renewed since the last Pairs (slack.go)
)

type slot struct {
	box       shapes.AABB
	cat, mask uint32
	flags     uint8
}

// awake reports whether the slot is a live dynamic body that is not asleep.
func (s *slot) awake() bool { return s.flags&(fLive|fStatic|fAsleep) == fLive }

// proxy is a body's box in sweep order: lo/hi along the sweep axis, then the
// two other axes, the more spread one first so that the sweep rejects early.
type proxy struct {
	lo, hi   float64
	lo1, hi1 float64
	lo2, hi2 float64
	id       int32
}

// SAP is a sweep-and-prune broad phase over axis-aligned boxes. The zero
// value is not usable; call New. An SAP is not safe for concurrent use.
type SAP struct {
	slots []slot
	live  int

	p     []proxy // listed awake bodies, sorted by lo after Pairs
	pend  []int32 // ids inserted since the last Pairs, not yet listed
	fresh []proxy // scratch: proxies of pend and of bodies that woke
	purge bool    // some listed body was removed

	still stillSet   // listed static and sleeping bodies (still.go)
	slack slackState // enlarged boxes and their kept pairs (slack.go)

	axes [3]int // axes[0] is the sweep axis; axes[1] is tested before axes[2]

	// Spread statistics of box centres (sums of 2*centre minus ref).
	ref      [3]float64
	variance [3]float64

	tmp   [][2]int32 // scratch for sorting pairs
	count []int32    // scratch for sorting pairs
}

// New returns an empty broad phase sweeping along x until the scene says
// otherwise.
func New() *SAP { return &SAP{axes: [3]int{0, 1, 2}} }

// Len is the number of bodies present.
func (s *SAP) Len() int { return s.live }

// Contains reports whether body id is present.
func (s *SAP) Contains(id int32) bool {
	return id >= 0 && int(id) < len(s.slots) && s.slots[id].flags&fLive != 0
}

// Axis is the sweep axis (0 x, 1 y, 2 z) chosen by the last call of Pairs
// from the spread of the box centres it saw.
func (s *SAP) Axis() int { return s.axes[0] }

// Insert adds body id with world bounds box. It is in every collision group
// and awake until told otherwise. Infinite bounds (a plane) are fine; NaN,
// Min > Max, Min = +Inf or Max = -Inf are errors.
func (s *SAP) Insert(id int32, box shapes.AABB, kind Kind) error {
	if id < 0 || id > MaxID {
		return fmt.Errorf("broad: insert body %d: %w (0 to %d)", id, ErrBadID, MaxID)
	}
	if kind != Dynamic && kind != Static {
		return fmt.Errorf("broad: insert body %d: unknown kind %d; use Dynamic or Static", id, kind)
	}
	if err := checkBox(box); err != nil {
		return fmt.Errorf("broad: insert body %d: %w", id, err)
	}
	if int(id) >= len(s.slots) {
		s.slots = slices.Grow(s.slots, int(id)+1-len(s.slots))[:id+1]
	}
	sl := &s.slots[id]
	if sl.flags&fLive != 0 {
		return fmt.Errorf("broad: insert body %d: %w; remove it first or use Move", id, ErrDuplicate)
	}
	sl.box = box
	s.setFat(id, box, true)
	sl.cat, sl.mask = AllBits, AllBits
	sl.flags = sl.flags&(fListed|fPending|fStill) | fLive
	if kind == Static {
		sl.flags |= fStatic
	}
	if sl.flags&fListed != 0 {
		// Back before Pairs dropped its proxy: its list and box may change.
		s.still.reclass, s.still.dirty = true, true
	}
	// A body removed and inserted again before Pairs keeps its proxy and
	// simply moves; otherwise it waits to be merged in.
	if sl.flags&(fListed|fPending) == 0 {
		sl.flags |= fPending
		s.pend = append(s.pend, id)
	}
	s.live++
	return nil
}

// Move sets the world bounds of body id, typically once per step.
func (s *SAP) Move(id int32, box shapes.AABB) error {
	sl, err := s.get(id, "move")
	if err != nil {
		return err
	}
	if err := checkBox(box); err != nil {
		return fmt.Errorf("broad: move body %d: %w", id, err)
	}
	sl.box = box
	s.setFat(id, box, false)
	if sl.flags&fStill != 0 {
		s.still.dirty = true
	}
	return nil
}

// Remove takes body id out; its id may be inserted again later.
func (s *SAP) Remove(id int32) error {
	sl, err := s.get(id, "remove")
	if err != nil {
		return err
	}
	sl.flags &^= fLive | fStatic | fAsleep
	if sl.flags&fListed != 0 {
		s.purge = true
	}
	s.forget()
	s.live--
	return nil
}

// SetAsleep marks body id asleep or awake. Pairs of two bodies that are
// each asleep or static are not reported. Static bodies count as asleep
// whatever this says.
func (s *SAP) SetAsleep(id int32, asleep bool) error {
	sl, err := s.get(id, "set asleep")
	if err != nil {
		return err
	}
	was := sl.flags
	if asleep {
		sl.flags |= fAsleep
	} else {
		sl.flags &^= fAsleep
	}
	if sl.flags != was && sl.flags&fListed != 0 {
		s.still.reclass = true // its proxy changes lists (still.go)
	}
	if sl.flags != was {
		s.forget()
	}
	return nil
}

// SetFilter sets the collision groups of body id: a pair (a, b) is reported
// only if a.category&b.mask != 0 and b.category&a.mask != 0. The default
// is AllBits for both; a category of 0 takes the body out of every pair.
func (s *SAP) SetFilter(id int32, category, mask uint32) error {
	sl, err := s.get(id, "set filter")
	if err != nil {
		return err
	}
	if sl.cat != category || sl.mask != mask {
		s.forget()
	}
	sl.cat, sl.mask = category, mask
	return nil
}

func (s *SAP) get(id int32, op string) (*slot, error) {
	if !s.Contains(id) {
		return nil, fmt.Errorf("broad: %s body %d: %w; insert it first", op, id, ErrUnknown)
	}
	return &s.slots[id], nil
}

func checkBox(b shapes.AABB) error {
	for k := 0; k < 3; k++ {
		lo, hi := b.Min[k], b.Max[k]
		// One test for the common case; NaN fails lo <= hi.
		if lo <= hi && lo <= math.MaxFloat64 && hi >= -math.MaxFloat64 {
			continue
		}
		switch {
		case math.IsNaN(lo) || math.IsNaN(hi):
			return fmt.Errorf("%w: NaN on axis %d (check the body's pose and shape)", ErrBadBox, k)
		case lo > hi:
			return fmt.Errorf("%w: min %g exceeds max %g on axis %d", ErrBadBox, lo, hi, k)
		default:
			return fmt.Errorf("%w: the box lies at infinity on axis %d (min %g, max %g)", ErrBadBox, k, lo, hi)
		}
	}
	return nil
}

// Pairs appends to dst every reportable pair of overlapping boxes, as
// {smaller id, larger id}, sorted by the first id and then the second, and
// returns the extended slice. Boxes that touch overlap. The work is an
// incremental re-sort of the previous order plus a sweep; with dst and the
// internal buffers grown, it allocates nothing.
func (s *SAP) Pairs(dst [][2]int32) [][2]int32 {
	if s.reusable() {
		return s.reusePairs(dst) // (slack.go)
	}
	if s.purge {
		s.compact()
	}
	s.fresh = s.fresh[:0]
	if s.still.reclass {
		s.reclassify() // (still.go)
	}
	// Refresh every awake proxy from its body's box, measuring the spread
	// of the centres on the way, then pick the sweep axis. The still
	// proxies are refreshed only when one of them has changed.
	var st spreadSums
	s.gather(s.p, &st)
	for _, id := range s.pend {
		sl := &s.slots[id]
		sl.flags &^= fPending
		if sl.flags&fLive != 0 && sl.flags&fListed == 0 {
			sl.flags |= fListed
			if sl.awake() {
				s.fresh = append(s.fresh, proxy{id: id})
			} else {
				s.addStill(id)
			}
		}
	}
	s.pend = s.pend[:0]
	s.gather(s.fresh, &st)
	s.stillSpread(&st)
	old := s.axes
	s.chooseAxes(&st)
	s.arrangeStill(old)

	if s.axes[0] != old[0] {
		// A new sweep axis: the old order says nothing, sort from scratch.
		s.remap(s.p, old)
		s.remap(s.fresh, old)
		slices.SortFunc(s.p, cmpProxy)
	} else {
		if s.axes != old {
			s.remap(s.p, old)
			s.remap(s.fresh, old)
		}
		// Coherent motion needs few shifts; bodies that jumped (a scene
		// reset, a teleport) could need n^2, so past n log n of them a
		// full sort takes over.
		if !insertionSort(s.p, len(s.p)*bits.Len(uint(len(s.p)))) {
			slices.SortFunc(s.p, cmpProxy)
		}
	}
	if len(s.fresh) > 0 {
		if len(s.fresh) <= 32 {
			insertionSort(s.fresh, len(s.fresh)*len(s.fresh))
		} else {
			slices.SortFunc(s.fresh, cmpProxy)
		}
		s.merge()
	}

	start := len(dst)
	dst = s.sweep(dst)
	dst = s.sweepStill(dst) // (still.go)
	s.sortPairs(dst[start:])
	return s.keepPairs(dst, start) // (slack.go)
}

// compact drops the proxies of removed bodies.
func (s *SAP) compact() {
	s.p = s.dropRemoved(s.p)
	if n := len(s.still.p); n > 0 {
		if s.still.p = s.dropRemoved(s.still.p); len(s.still.p) != n {
			s.still.dirty = true
		}
	}
	s.purge = false
}

func (s *SAP) dropRemoved(ps []proxy) []proxy {
	w := 0
	for _, q := range ps {
		sl := &s.slots[q.id]
		if sl.flags&fLive != 0 {
			ps[w] = q
			w++
		} else {
			sl.flags &^= fListed | fStill
		}
	}
	return ps[:w]
}

type spreadSums struct {
	n      [3]float64
	s1, s2 [3]float64
}

// gather copies each proxy's box from its slot in the current axis order and
// accumulates the spread of the (doubled) box centres along x, y and z.
// Infinite boxes (planes) have no centre and are left out of the spread.
func (s *SAP) gather(ps []proxy, st *spreadSums) {
	a0, a1, a2 := s.axes[0], s.axes[1], s.axes[2]
	ref := s.ref
	for k := range ps {
		q := &ps[k]
		b := &s.slack.fat[q.id] // the box itself without slack (slack.go)
		q.lo, q.hi = b.Min[a0], b.Max[a0]
		q.lo1, q.hi1 = b.Min[a1], b.Max[a1]
		q.lo2, q.hi2 = b.Min[a2], b.Max[a2]
		for ax := 0; ax < 3; ax++ {
			c := b.Min[ax] + b.Max[ax]
			if d := c - ref[ax]; d-d == 0 { // finite
				st.n[ax]++
				st.s1[ax] += d
				st.s2[ax] += d * d
			}
		}
	}
}

// chooseAxes turns the spread sums into variances, keeps them shifted around
// their mean for the next call, and re-ranks the axes with hysteresis.
func (s *SAP) chooseAxes(st *spreadSums) {
	for ax := 0; ax < 3; ax++ {
		if st.n[ax] == 0 {
			s.variance[ax] = 0
			continue
		}
		m := st.s1[ax] / st.n[ax]
		s.variance[ax] = math.Max(0, st.s2[ax]/st.n[ax]-m*m)
		s.ref[ax] += m
	}
	v := s.variance
	better := func(a, b int) bool { return v[a] > axisSwitchRatio*v[b] }
	a := s.axes
	// Sweep axis: the most spread axis, if clearly better than the current.
	best := a[0]
	for ax := 0; ax < 3; ax++ {
		if v[ax] > v[best] {
			best = ax
		}
	}
	if best != a[0] && better(best, a[0]) {
		rest := otherAxes(best)
		if v[rest[1]] > v[rest[0]] {
			rest[0], rest[1] = rest[1], rest[0]
		}
		a = [3]int{best, rest[0], rest[1]}
	}
	if better(a[2], a[1]) {
		a[1], a[2] = a[2], a[1]
	}
	s.axes = a
}

func otherAxes(ax int) [2]int {
	switch ax {
	case 0:
		return [2]int{1, 2}
	case 1:
		return [2]int{0, 2}
	}
	return [2]int{0, 1}
}

// remap rewrites proxies gathered in axis order old into the current order.
func (s *SAP) remap(ps []proxy, old [3]int) {
	for k := range ps {
		q := &ps[k]
		var lo, hi [3]float64
		lo[old[0]], hi[old[0]] = q.lo, q.hi
		lo[old[1]], hi[old[1]] = q.lo1, q.hi1
		lo[old[2]], hi[old[2]] = q.lo2, q.hi2
		a := s.axes
		q.lo, q.hi = lo[a[0]], hi[a[0]]
		q.lo1, q.hi1 = lo[a[1]], hi[a[1]]
		q.lo2, q.hi2 = lo[a[2]], hi[a[2]]
	}
}

func cmpProxy(a, b proxy) int {
	switch {
	case a.lo < b.lo:
		return -1
	case a.lo > b.lo:
		return 1
	}
	return int(a.id) - int(b.id)
}

// insertionSort restores the order by lo. Each body moves past only the few
// boxes it overtook since the last step, so this is close to linear for
// coherent motion (the point of sweep and prune). It gives up, leaving p
// permuted but unsorted, once it has shifted more than budget entries.
func insertionSort(p []proxy, budget int) bool {
	for i := 1; i < len(p); i++ {
		if p[i-1].lo <= p[i].lo {
			continue
		}
		x := p[i]
		j := i - 1
		for j >= 0 && p[j].lo > x.lo {
			p[j+1] = p[j]
			j--
		}
		p[j+1] = x
		if budget -= i - 1 - j; budget < 0 {
			return false
		}
	}
	return true
}

// merge merges the sorted s.fresh into the sorted s.p, from the back.
func (s *SAP) merge() {
	n, m := len(s.p), len(s.fresh)
	s.p = append(s.p, s.fresh...)
	p, f := s.p, s.fresh
	i, j := n-1, m-1
	for k := n + m - 1; j >= 0; k-- {
		if i >= 0 && p[i].lo > f[j].lo {
			p[k] = p[i]
			i--
		} else {
			p[k] = f[j]
			j--
		}
	}
}

// sweep walks the proxies in order of lo. The boxes whose interval along the
// sweep axis overlaps that of box i and that come after it are exactly those
// up to the first one starting beyond hi_i; only these get the test on the
// two other axes.
func (s *SAP) sweep(dst [][2]int32) [][2]int32 {
	p := s.p
	for i := range p {
		q := &p[i]
		hi, l1, h1, l2, h2 := q.hi, q.lo1, q.hi1, q.lo2, q.hi2
		for j := i + 1; j < len(p); j++ {
			r := &p[j]
			if r.lo > hi {
				break
			}
			// Quick rejection on the second axis with one branch, as most
			// boxes fail here and a branch per comparison would be
			// mispredicted half the time. With d1 = lo_j - hi_i and d2 =
			// lo_i - hi_j, the intervals are apart exactly when one of d1,
			// d2 is positive; then the other is negative (d1 + d2 <= 0), so
			// the product is negative. The test never rejects overlapping
			// boxes (a zero or infinite factor gives a product >= 0 or NaN;
			// checkBox rules out Inf - Inf), but an underflowing product can
			// let a separated pair through, so the exact test follows.
			if (r.lo1-h1)*(l1-r.hi1) < 0 {
				continue
			}
			if r.lo1 > h1 || r.hi1 < l1 || r.lo2 > h2 || r.hi2 < l2 {
				continue
			}
			dst = s.report(dst, q.id, r.id)
		}
	}
	return dst
}

// report appends the pair (a, b) if the rule admits it.
func (s *SAP) report(dst [][2]int32, a, b int32) [][2]int32 {
	sa, sb := &s.slots[a], &s.slots[b]
	if !(sa.awake() || sb.awake()) || sa.cat&sb.mask == 0 || sb.cat&sa.mask == 0 {
		return dst
	}
	if a > b {
		a, b = b, a
	}
	return append(dst, [2]int32{a, b})
}

func cmpPair(a, b [2]int32) int {
	if a[0] != b[0] {
		return int(a[0]) - int(b[0])
	}
	return int(a[1]) - int(b[1])
}

// sortPairs sorts seg by (first, second): a comparison sort when seg is small
// next to the id range, else a two-pass least-significant-digit radix sort
// (counting sort by the second id, then stably by the first), linear in the
// number of pairs plus ids.
func (s *SAP) sortPairs(seg [][2]int32) {
	nid := len(s.slots)
	// Radix: four passes over the pairs and four over the ids; comparison
	// sort: about log2(len) comparisons per pair, each several times
	// dearer than a pass step.
	if len(seg)*bits.Len(uint(len(seg))) < 2*nid {
		slices.SortFunc(seg, cmpPair)
		return
	}
	if cap(s.tmp) < len(seg) {
		s.tmp = make([][2]int32, len(seg), len(seg)+len(seg)/2) // slack: the count varies step to step
	}
	if cap(s.count) < nid+1 {
		s.count = make([]int32, nid+1)
	}
	tmp, count := s.tmp[:len(seg)], s.count[:nid+1]
	countingSort(tmp, seg, count, 1)
	countingSort(seg, tmp, count, 0)
}

// countingSort writes src into dst stably ordered by element c.
func countingSort(dst, src [][2]int32, count []int32, c int) {
	clear(count)
	for _, q := range src {
		count[q[c]+1]++
	}
	for k := 1; k < len(count); k++ {
		count[k] += count[k-1]
	}
	for _, q := range src {
		dst[count[q[c]]] = q
		count[q[c]]++
	}
}
