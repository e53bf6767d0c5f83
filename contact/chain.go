package contact

// Impacts into a chain of touching bodies.
//
// An impact that closes a gap within the step is normally deferred: the
// velocity solve stops the bodies at the gap and the bounce follows the
// next step (impacts, held.go). The stop is an inelastic push, and where
// the struck body touches a third one without load between them (a ball of
// Newton's cradle, a part against a neighbour), the velocity solve passes
// that push on through the touching contact: the whole chain starts moving
// together, and the next step finds its contacts loaded, so they never
// impact. The striker then bounces off a chain that is already moving, and
// the impact no longer travels through it (a 5-ball cradle with e = 1 ended
// with the striker thrown back and four balls moving together).
//
// Such an impact is therefore not deferred: it is resolved in the step in
// which its gap closes, on the velocities the bodies arrived with, and the
// passes of the impact phase carry it through the chain one pair at a time
// (the sequence of pairwise impacts of Guendelman, Bridson and Fedkiw,
// "Nonconvex rigid bodies with stacking", SIGGRAPH 2003). The bodies part
// at most the gap short of touching, the distance they cover in a step;
// velocities, momentum and the energy of the sequence are exact.

// noChain marks a slot without a touching, unloaded contact; manyChains one
// with such contacts in two or more pairs.
const (
	noChain    = -1
	manyChains = -2
)

// markChains records, for each slot, the pair group of its touching
// contacts that carried no load last step: the contacts that an inelastic
// stop of another pair would push through. A pair with any loaded point (a
// part resting on a floor or in a stack, whose other points may carry
// nothing) takes a stop's push as a support does, and is left out.
func (s *Solver) markChains(dt float64) {
	s.chain = grow(s.chain, len(s.sl.gid))
	for k := range s.chain {
		s.chain[k] = noChain
	}
	if len(s.groups) <= 2 {
		// One pair: chained looks for the chains of other pairs only.
		return
	}
	for g := 0; g+1 < len(s.groups); g++ {
		touching, loaded := false, false
		for i := int(s.groups[g]); i < int(s.groups[g+1]); i++ {
			ps, rn := &s.pts[i], &s.nrows[i]
			if rn.mass == 0 {
				continue
			}
			loaded = loaded || s.carriedLoad(ps, rn, s.bounceThreshold(ps, dt))
			touching = touching || ps.sep <= ps.slop
		}
		if touching && !loaded {
			rn := &s.nrows[s.groups[g]]
			s.markChain(rn.a, int32(g))
			s.markChain(rn.b, int32(g))
		}
	}
}

func (s *Solver) markChain(slot, g int32) {
	if slot == fixedSlot {
		return
	}
	switch c := s.chain[slot]; {
	case c == noChain:
		s.chain[slot] = g
	case c != g:
		s.chain[slot] = manyChains
	}
}

// chained reports whether a body of point row rn, in pair group g, touches
// a body of another pair without load: its impact must not be deferred.
func (s *Solver) chained(g int, rn *crow) bool {
	other := func(slot int32) bool {
		c := s.chain[slot]
		return slot != fixedSlot && c != noChain && c != int32(g)
	}
	return other(rn.a) || other(rn.b)
}

// carriedLoad reports whether a point carried load last step: its normal
// impulse then changed the approach speed by more than loadFraction of its
// bounce threshold thr. Such a contact is resting, never an impact.
func (s *Solver) carriedLoad(ps *pstate, rn *crow, thr float64) bool {
	return ps.found && ps.prevN*rn.k > thr*loadFraction
}
