package collide

import "math"

// normalMemoLen is the number of triangle normals a normalMemo holds. The
// triangles of one tessellated flat share their normal up to rounding: a
// flat's normals come out as two or three neighbouring values (unit()
// of a cross product is exact only to an ulp), interleaved in the order of
// the triangles, so one remembered value would be replaced at almost every
// triangle.
const normalMemoLen = 4

// A normalMemo remembers, within one mesh query, a value computed from a
// triangle normal (the part's lowest point along it, or its face most
// anti-parallel to it) for the last few normals seen. It gives exactly what
// the computation gives: the last normal matches as a value (==, as a
// memo of one entry would), older ones only bit for bit, so that a
// normal that differs from the stored one only in the sign of a zero is
// computed afresh wherever a memo of one entry would do so.
type normalMemo[T any] struct {
	n       [normalMemoLen]vec3
	val     [normalMemoLen]T
	k, last int
}

// reset forgets all normals.
func (c *normalMemo[T]) reset() { c.k, c.last = 0, 0 }

// find returns the entry remembered for n (its value is val[i]), or -1.
func (c *normalMemo[T]) find(n *vec3) int {
	if c.k > 0 && c.n[c.last] == *n {
		return c.last
	}
	for i := 0; i < c.k; i++ {
		if sameBits(&c.n[i], n) {
			c.last = i
			return i
		}
	}
	return -1
}

// put remembers x for n and returns its entry, replacing the entry after
// the last one used once the memo is full.
func (c *normalMemo[T]) put(n *vec3, x T) int {
	i := c.k
	if i < normalMemoLen {
		c.k++
	} else {
		i = (c.last + 1) % normalMemoLen
	}
	c.n[i], c.val[i], c.last = *n, x, i
	return i
}

// sameBits reports whether a and b are equal bit for bit.
func sameBits(a, b *vec3) bool {
	return math.Float64bits(a[0]) == math.Float64bits(b[0]) &&
		math.Float64bits(a[1]) == math.Float64bits(b[1]) &&
		math.Float64bits(a[2]) == math.Float64bits(b[2])
}

// dotSub is n.Dot(p.Sub(a)) for vectors passed by pointer: the same
// operations in the same order, without the copies of whole vectors the
// compiler makes for the method calls in the loop over a mesh's triangles.
func dotSub(n, p, a *vec3) float64 {
	return n[0]*(p[0]-a[0]) + n[1]*(p[1]-a[1]) + n[2]*(p[2]-a[2])
}
