package broad

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"clatter/shapes"
)

// TestStillLists checks the awake and still lists against the brute-force
// reference AllPairs while bodies fall asleep, wake, and long static
// fixtures (which the search must not miss) lie among short boxes.
func TestStillLists(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 3))
	m := newMirror(t)
	const n = 600
	id := int32(0)
	// Long static bars along each axis, as trays and rails are.
	for k := 0; k < 6; k++ {
		h := shapes.Vec3{0.5, 0.5, 0.5}
		h[k%3] = 12
		c := shapes.Vec3{rng.Float64() * 20, rng.Float64() * 20, rng.Float64() * 20}
		m.insert(Body{ID: id, Box: boxAt(c, h), Kind: Static, Category: AllBits, Mask: AllBits})
		id++
	}
	for ; id < n; id++ {
		c := shapes.Vec3{rng.Float64() * 20, rng.Float64() * 20, rng.Float64() * 20}
		b := Body{ID: id, Box: boxAt(c, shapes.Vec3{0.6, 0.6, 0.6}), Category: AllBits, Mask: AllBits}
		if id%7 == 0 {
			b.Kind = Static
		} else {
			b.Asleep = rng.Float64() < 0.5
		}
		m.insert(b)
	}
	total := 0
	for step := 0; step < 12; step++ {
		for i := int32(6); i < n; i++ {
			b := m.bodies[i]
			if b.Kind == Static {
				continue
			}
			if rng.Float64() < 0.1 {
				m.sleep(i, !b.Asleep)
				b = m.bodies[i]
			}
			if !b.Asleep {
				d := shapes.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}.Mul(0.6)
				m.move(i, shapes.AABB{Min: b.Box.Min.Add(d), Max: b.Box.Max.Add(d)})
			}
		}
		if step == 6 {
			// A static fixture moved by hand.
			b := m.bodies[0]
			m.move(0, shapes.AABB{Min: b.Box.Min.Add(shapes.Vec3{1, 1, 1}), Max: b.Box.Max.Add(shapes.Vec3{1, 1, 1})})
		}
		total += m.check(fmt.Sprintf("step %d", step))
	}
	// 600 boxes of 1.2 in a 20-cube, half of them able to report: some
	// hundreds of pairs per step, or the test proves little.
	if total < 12*100 {
		t.Fatalf("only %d pairs in 12 steps: the scene is too sparse to test anything", total)
	}
}
