package contact

// A step "fails to hold" a contact when it ends with friction at the cone's
// limit and the contact still slipping faster than its creep limit (see
// Settings.CreepSpeed). The limit is the smaller of CreepSpeed, the
// fastest creep that counts as holding, and a part in proportion to the
// contact's load: the slip that a friction impulse as large as this
// step's normal impulse would take away, the contact's own scale of
// velocity (for a part resting under gravity about g cos(theta) dt). The
// slip that the sweeps leave in a contact that static friction holds is a
// fraction of that scale, whatever the step and the part's size, so a
// contact that breaks loose, accelerating at a, exceeds the limit after a
// number of steps that does not grow as the step shrinks: its breakaway
// comes a time late that vanishes with the step. The fixed speed alone
// made it CreepSpeed / a late at any step (at tan(theta) = 1.001 mu_s, 20
// ms: 200 steps of 0.1 ms).

// creepLimit is the creep limit (m/s) of a contact whose load makes the
// velocity scale given, with its ratio; its floor is ten times the sweeps'
// absolute stopping tolerance.
func (s *Solver) creepLimit(scale, ratio float64) float64 {
	return min(s.Settings.CreepSpeed, 10*s.Settings.Tolerance+ratio*scale)
}

// pointCreep is the creep limit of point i (m/s).
func (s *Solver) pointCreep(i int) float64 {
	r1, r2 := &s.trows[2*i], &s.trows[2*i+1]
	return s.creepLimit(s.nrows[i].lambda*max(r1.k, r2.k), s.Settings.CreepRatio)
}

// patchCreep is the creep limit of a patch (m/s).
func (s *Solver) patchCreep(pa *patch) float64 {
	return s.creepLimit(s.normalSum(pa)*max(pa.rows[0].k, pa.rows[1].k), s.Settings.PatchCreepRatio)
}
