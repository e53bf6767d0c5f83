package collide

// GJK warm start for CollidePair: the directions of the points of GJK's
// final simplex are kept per pair, in the frame of the query's first view A
// (so that they mean the same next step wherever the bodies went), and the
// pair's next GJK starts from the support points along them (gjkFrom). Any
// points of the Minkowski difference make a valid start, so the distance
// and the overlap GJK reports are those of a cold start to its tolerance;
// a pair that barely moved finds last step's simplex again and ends after
// one reduction (G. van den Bergen, "Collision Detection in Interactive 3D
// Environments", Morgan Kaufmann 2003, on exploiting frame coherence).
// Collide and the other cold queries start as before, in every bit.

// warmStart is the general path's memory of one pair.
type warmStart struct {
	ndir int8
	dirs [4]vec3 // GJK's last simplex directions, in A's frame
	// sizes of the two views: the memory is for these shapes only.
	sizeA, sizeB float64
}

// warmDirs returns the current CollidePair query's simplex directions for
// views a and b in the query frame, in d's scratch space (none for a cold
// query or other shapes).
func (d *Detector) warmDirs(a, b *view) []vec3 {
	c := &d.cache
	w := &c.in.warm
	if !c.on || w.sizeA != a.size || w.sizeB != b.size {
		return nil
	}
	out := c.warmBuf[:w.ndir]
	for i := range out {
		out[i] = mul(a.rot, w.dirs[i])
	}
	return out
}

// keepWarm records the simplex GJK ended with for the pair's next query.
func (d *Detector) keepWarm(a, b *view) {
	c := &d.cache
	if !c.on {
		return
	}
	w := &c.out.warm
	w.sizeA, w.sizeB = a.size, b.size
	s := &d.smp
	w.ndir = int8(s.n)
	for i := 0; i < s.n; i++ {
		w.dirs[i] = mulT(a.rot, s.dir[i])
	}
}
