package broad

import "clatter/internal/scratch"

// Reset removes every body: the SAP is then what New returns, except that
// it keeps the memory of its buffers (zeroed), so that a world reused for
// another trial makes no new ones. Every field not handed on here starts
// as in a new SAP.
func (s *SAP) Reset() {
	n := *New()
	n.slots = scratch.Reuse(s.slots)
	n.p, n.pend, n.fresh = scratch.Reuse(s.p), scratch.Reuse(s.pend), scratch.Reuse(s.fresh)
	n.still.p, n.still.big = scratch.Reuse(s.still.p), scratch.Reuse(s.still.big)
	n.tmp, n.count = scratch.Reuse(s.tmp), scratch.Reuse(s.count)
	ss := &s.slack
	n.slack.fat, n.slack.moved = scratch.Reuse(ss.fat), scratch.Reuse(ss.moved)
	n.slack.kept, n.slack.add, n.slack.next = scratch.Reuse(ss.kept), scratch.Reuse(ss.add), scratch.Reuse(ss.next)
	*s = n
}
