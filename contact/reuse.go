package contact

import "clatter/internal/scratch"

// Clear makes s what NewSolver(set) returns, with no memory of earlier
// solves, except that it keeps the memory of its buffers (zeroed), so
// that a world reused for another trial makes no new ones. Every field not
// handed on here starts as in a new Solver.
func (s *Solver) Clear(set Settings) {
	n := *NewSolver(set)
	n.sl = slots{gid: scratch.Reuse(s.sl.gid), fixed: scratch.Reuse(s.sl.fixed), vel: scratch.Reuse(s.sl.vel),
		ps: scratch.Reuse(s.sl.ps), fv: scratch.Reuse(s.sl.fv), fs: scratch.Reuse(s.sl.fs), im: scratch.Reuse(s.sl.im),
		cap: scratch.Reuse(s.sl.cap)}
	n.nrows, n.trows, n.jrows, n.pts, n.jp = scratch.Reuse(s.nrows), scratch.Reuse(s.trows), scratch.Reuse(s.jrows), scratch.Reuse(s.pts), scratch.Reuse(s.jp)
	n.groups = scratch.Reuse(s.groups)
	n.prevPts, n.curPts, n.prevKeys = scratch.Reuse(s.prevPts), scratch.Reuse(s.curPts), scratch.Reuse(s.prevKeys)
	n.prevRows, n.curRows = scratch.Reuse(s.prevRows), scratch.Reuse(s.curRows)
	n.byKey, n.keyTmp = scratch.Reuse(s.byKey), scratch.Reuse(s.keyTmp)
	n.match, n.owner = scratch.Reuse(s.match), scratch.Reuse(s.owner)
	n.prevPair, n.curPair = scratch.Reuse(s.prevPair), scratch.Reuse(s.curPair)
	n.claimed = scratch.Reuse(s.claimed)
	n.blk = s.blk.reused()
	n.live = liveState{moved: scratch.Reuse(s.live.moved), drift: scratch.Reuse(s.live.drift), seen: scratch.Reuse(s.live.seen), rows: scratch.Reuse(s.live.rows)}
	n.patches = patchState{list: scratch.Reuse(s.patches.list), ofGroup: scratch.Reuse(s.patches.ofGroup), mem: scratch.Reuse(s.patches.mem)}
	n.heldSums = scratch.Reuse(s.heldSums)
	n.chain = scratch.Reuse(s.chain)
	*s = n
}

// reused is an empty block state with b's buffers.
func (b *blockState) reused() blockState {
	return blockState{
		parent: scratch.Reuse(b.parent), size: scratch.Reuse(b.size), start: scratch.Reuse(b.start), order: scratch.Reuse(b.order),
		a: scratch.Reuse(b.a), l: scratch.Reuse(b.l), v0: scratch.Reuse(b.v0), x: scratch.Reuse(b.x),
		lam: scratch.Reuse(b.lam), tgt: scratch.Reuse(b.tgt), active: scratch.Reuse(b.active), free: scratch.Reuse(b.free),
		sub: scratch.Reuse(b.sub), pos: scratch.Reuse(b.pos), col: scratch.Reuse(b.col), y: scratch.Reuse(b.y), z: scratch.Reuse(b.z),
		rows: scratch.Reuse(b.rows), kind: scratch.Reuse(b.kind), of: scratch.Reuse(b.of), cnt: scratch.Reuse(b.cnt),
		root: scratch.Reuse(b.root), excess: scratch.Reuse(b.excess),
		held: scratch.Reuse(b.held), hfree: scratch.Reuse(b.hfree),
		band: b.band.reused(), // band.go
	}
}
