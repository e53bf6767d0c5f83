package broad

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"clatter/shapes"
)

// mirror keeps the test's own copy of the scene, fed to both SAP and the
// brute-force reference AllPairs.
type mirror struct {
	t      *testing.T
	s      *SAP
	bodies []Body // indexed by id
	in     []bool
}

func newMirror(t *testing.T) *mirror { return &mirror{t: t, s: New()} }

func (m *mirror) insert(b Body) {
	m.t.Helper()
	if err := m.s.Insert(b.ID, b.Box, b.Kind); err != nil {
		m.t.Fatal(err)
	}
	if b.Category != AllBits || b.Mask != AllBits {
		if err := m.s.SetFilter(b.ID, b.Category, b.Mask); err != nil {
			m.t.Fatal(err)
		}
	}
	if b.Asleep {
		if err := m.s.SetAsleep(b.ID, true); err != nil {
			m.t.Fatal(err)
		}
	}
	for int(b.ID) >= len(m.bodies) {
		m.bodies = append(m.bodies, Body{})
		m.in = append(m.in, false)
	}
	m.bodies[b.ID], m.in[b.ID] = b, true
}

func (m *mirror) remove(id int32) {
	m.t.Helper()
	if err := m.s.Remove(id); err != nil {
		m.t.Fatal(err)
	}
	m.in[id] = false
}

func (m *mirror) move(id int32, box shapes.AABB) {
	m.t.Helper()
	if err := m.s.Move(id, box); err != nil {
		m.t.Fatal(err)
	}
	m.bodies[id].Box = box
}

func (m *mirror) sleep(id int32, asleep bool) {
	m.t.Helper()
	if err := m.s.SetAsleep(id, asleep); err != nil {
		m.t.Fatal(err)
	}
	m.bodies[id].Asleep = asleep
}

func (m *mirror) present() []Body {
	var out []Body
	for id, b := range m.bodies {
		if m.in[id] {
			out = append(out, b)
		}
	}
	return out
}

// check compares SAP.Pairs with the brute-force reference and returns the
// number of pairs.
func (m *mirror) check(step string) int {
	m.t.Helper()
	got := m.s.Pairs(nil)
	want := AllPairs(nil, m.present())
	if !slices.Equal(got, want) {
		m.t.Fatalf("%s: SAP gives %d pairs, all-pairs reference %d; first difference: %s",
			step, len(got), len(want), firstDiff(got, want))
	}
	return len(got)
}

func firstDiff(got, want [][2]int32) string {
	for i := 0; i < len(got) || i < len(want); i++ {
		switch {
		case i >= len(got):
			return fmt.Sprintf("missing %v", want[i])
		case i >= len(want):
			return fmt.Sprintf("extra %v", got[i])
		case got[i] != want[i]:
			return fmt.Sprintf("at %d got %v want %v", i, got[i], want[i])
		}
	}
	return "none"
}

func boxAt(c shapes.Vec3, h shapes.Vec3) shapes.AABB {
	return shapes.AABB{Min: c.Sub(h), Max: c.Add(h)}
}

// randomScene describes a random test scene.
type randomScene struct {
	name      string
	n         int
	steps     int
	region    shapes.Vec3 // boxes' centres lie in [0, region]
	static    float64     // fraction of static bodies
	asleep    float64     // fraction of dynamic bodies asleep at any time
	filters   bool        // random categories and masks
	churn     int         // bodies removed and added between steps
	planes    int         // static infinite boxes
	quantize  float64     // if > 0, centres and sizes snap to this grid (exact ties)
	speed     float64     // max displacement per step along each axis
	wantPairs int         // the scene must produce at least this many pairs per step (else the test proves little)
}

func TestPairsMatchAllPairs(t *testing.T) {
	cases := []randomScene{
		{name: "cube cloud", n: 2000, steps: 6, region: shapes.Vec3{30, 30, 30}, speed: 0.3, wantPairs: 200},
		{name: "flat layer", n: 3000, steps: 6, region: shapes.Vec3{80, 80, 1}, speed: 0.3, wantPairs: 200},
		{name: "long line along y", n: 2000, steps: 6, region: shapes.Vec3{2, 400, 2}, speed: 0.5, wantPairs: 200},
		{name: "static and sleeping", n: 2000, steps: 6, region: shapes.Vec3{30, 30, 30}, static: 0.3, asleep: 0.3, speed: 0.3, wantPairs: 100},
		{name: "filters", n: 2000, steps: 6, region: shapes.Vec3{30, 30, 30}, filters: true, speed: 0.3, wantPairs: 50},
		{name: "churn", n: 2000, steps: 8, region: shapes.Vec3{30, 30, 30}, churn: 150, static: 0.1, asleep: 0.1, speed: 0.3, wantPairs: 100},
		{name: "planes", n: 1000, steps: 5, region: shapes.Vec3{20, 20, 20}, planes: 3, static: 0.2, asleep: 0.2, speed: 0.3, wantPairs: 100},
		{name: "grid ties", n: 2000, steps: 6, region: shapes.Vec3{20, 20, 20}, quantize: 0.5, speed: 1, wantPairs: 200},
		{name: "fast motion", n: 1500, steps: 5, region: shapes.Vec3{25, 25, 25}, speed: 10, wantPairs: 30},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) { runRandomScene(t, tc, 1) })
	}
}

func runRandomScene(t *testing.T, sc randomScene, seed uint64) {
	rng := rand.New(rand.NewPCG(seed, 42))
	m := newMirror(t)
	q := func(x float64) float64 {
		if sc.quantize > 0 {
			return math.Round(x/sc.quantize) * sc.quantize
		}
		return x
	}
	randBox := func() shapes.AABB {
		var c, h shapes.Vec3
		for k := 0; k < 3; k++ {
			c[k] = q(rng.Float64() * sc.region[k])
			h[k] = q(0.2 + 0.6*rng.Float64())
		}
		return boxAt(c, h)
	}
	nextID := int32(0)
	newBody := func() Body {
		b := Body{ID: nextID, Box: randBox(), Category: AllBits, Mask: AllBits}
		nextID++
		if rng.Float64() < sc.static {
			b.Kind = Static
		}
		if b.Kind == Dynamic && rng.Float64() < sc.asleep {
			b.Asleep = true
		}
		if sc.filters {
			b.Category = 1 << rng.IntN(4)
			b.Mask = uint32(rng.IntN(16))
		}
		return b
	}
	inf := math.Inf(1)
	for i := 0; i < sc.planes; i++ {
		b := Body{ID: nextID, Kind: Static, Category: AllBits, Mask: AllBits,
			Box: shapes.AABB{Min: shapes.Vec3{-inf, -inf, -inf}, Max: shapes.Vec3{inf, inf, inf}}}
		if i == 1 { // a half-space z <= 0.5 region height: infinite below
			b.Box.Max[2] = 0.5 * sc.region[2]
		}
		nextID++
		m.insert(b)
	}
	for i := 0; i < sc.n; i++ {
		m.insert(newBody())
	}
	unfiltered := 0
	for step := 0; step < sc.steps; step++ {
		// Random motion of dynamic bodies.
		for id, b := range m.bodies {
			if !m.in[id] || b.Kind == Static || math.IsInf(b.Box.Min[0], 0) {
				continue
			}
			var d shapes.Vec3
			for k := 0; k < 3; k++ {
				d[k] = q((2*rng.Float64() - 1) * sc.speed)
			}
			m.move(int32(id), shapes.AABB{Min: b.Box.Min.Add(d), Max: b.Box.Max.Add(d)})
			if sc.asleep > 0 && rng.Float64() < 0.1 {
				m.sleep(int32(id), rng.Float64() < sc.asleep)
			}
		}
		// Churn: remove random bodies (sometimes re-inserting the same id
		// before the next query) and add new ones.
		for i := 0; i < sc.churn; i++ {
			id := int32(rng.IntN(int(nextID)))
			if !m.in[id] || math.IsInf(m.bodies[id].Box.Min[0], 0) {
				continue
			}
			m.remove(id)
			if rng.IntN(3) == 0 {
				b := newBody()
				nextID--
				b.ID = id
				m.insert(b)
			}
		}
		for i := 0; i < sc.churn; i++ {
			m.insert(newBody())
		}
		n := m.check(fmt.Sprintf("step %d", step))
		if n < sc.wantPairs {
			t.Fatalf("step %d: only %d pairs, scene too sparse to test (want >= %d)", step, n, sc.wantPairs)
		}
		if sc.filters {
			// The filters must actually remove pairs, or this case tests nothing.
			bs := m.present()
			for i := range bs {
				bs[i].Category, bs[i].Mask = AllBits, AllBits
			}
			unfiltered = len(AllPairs(nil, bs))
			if unfiltered <= n {
				t.Fatalf("step %d: filters removed no pairs (%d with, %d without)", step, n, unfiltered)
			}
		}
	}
}

// TestRule checks the reporting rule on two overlapping boxes, for SAP and
// the reference alike (the rule as stated in the package documentation).
func TestRule(t *testing.T) {
	cases := []struct {
		name       string
		a, b       Body
		wantReport bool
	}{
		{"dynamic-dynamic", Body{Kind: Dynamic}, Body{Kind: Dynamic}, true},
		{"dynamic-static", Body{Kind: Dynamic}, Body{Kind: Static}, true},
		{"static-static", Body{Kind: Static}, Body{Kind: Static}, false},
		{"asleep-asleep", Body{Asleep: true}, Body{Asleep: true}, false},
		{"asleep-awake", Body{Asleep: true}, Body{}, true},
		{"asleep-static", Body{Asleep: true}, Body{Kind: Static}, false},
		{"category in mask both ways", Body{Category: 1, Mask: 2}, Body{Category: 2, Mask: 1}, true},
		{"masks with extra bits", Body{Category: 1, Mask: 2}, Body{Category: 2, Mask: 3}, true},
		{"b's category not in a's mask", Body{Category: 1, Mask: 1}, Body{Category: 2, Mask: 1}, false},
		{"a's category not in b's mask", Body{Category: 4, Mask: 2}, Body{Category: 2, Mask: 1}, false},
		{"zero category", Body{Category: 0, Mask: AllBits}, Body{}, false},
		{"zero mask", Body{Category: AllBits, Mask: 0}, Body{}, false},
	}
	box := shapes.AABB{Min: shapes.Vec3{0, 0, 0}, Max: shapes.Vec3{1, 1, 1}}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			a, b := tc.a, tc.b
			a.ID, b.ID, a.Box, b.Box = 7, 3, box, box
			for _, x := range []*Body{&a, &b} {
				if x.Category == 0 && x.Mask == 0 {
					x.Category, x.Mask = AllBits, AllBits
				}
			}
			want := [][2]int32(nil)
			if tc.wantReport {
				want = [][2]int32{{3, 7}}
			}
			if got := AllPairs(nil, []Body{a, b}); !slices.Equal(got, want) {
				t.Errorf("AllPairs = %v, want %v", got, want)
			}
			m := newMirror(t)
			m.insert(a)
			m.insert(b)
			if got := m.s.Pairs(nil); !slices.Equal(got, want) {
				t.Errorf("SAP.Pairs = %v, want %v", got, want)
			}
		})
	}
}

// TestDegenerate covers boxes of zero size, identical boxes, touching and
// nearly touching boxes, huge and infinite boxes. Expected pairs are worked
// out by hand from the boxes.
func TestDegenerate(t *testing.T) {
	inf := math.Inf(1)
	v := func(x, y, z float64) shapes.Vec3 { return shapes.Vec3{x, y, z} }
	bx := func(a, b shapes.Vec3) shapes.AABB { return shapes.AABB{Min: a, Max: b} }
	unit := bx(v(0, 0, 0), v(1, 1, 1))
	everything := bx(v(-inf, -inf, -inf), v(inf, inf, inf))
	below := bx(v(-inf, -inf, -inf), v(inf, inf, 0)) // the half-space z <= 0
	gap := math.Nextafter(1, 2)                      // the next float after 1: a gap of one ulp
	cases := []struct {
		name   string
		bodies []Body
		want   [][2]int32
	}{
		{"two points at the same place", []Body{{ID: 0, Box: bx(v(1, 2, 3), v(1, 2, 3))}, {ID: 1, Box: bx(v(1, 2, 3), v(1, 2, 3))}}, [][2]int32{{0, 1}}},
		{"two points one ulp apart", []Body{{ID: 0, Box: bx(v(1, 2, 3), v(1, 2, 3))}, {ID: 1, Box: bx(v(gap, 2, 3), v(gap, 2, 3))}}, nil},
		{"point on a box corner", []Body{{ID: 0, Box: unit}, {ID: 1, Box: bx(v(1, 1, 1), v(1, 1, 1))}}, [][2]int32{{0, 1}}},
		{"identical boxes", []Body{{ID: 2, Box: unit}, {ID: 0, Box: unit}, {ID: 1, Box: unit}}, [][2]int32{{0, 1}, {0, 2}, {1, 2}}},
		{"faces touching on x", []Body{{ID: 0, Box: unit}, {ID: 1, Box: bx(v(1, 0, 0), v(2, 1, 1))}}, [][2]int32{{0, 1}}},
		{"faces touching on z", []Body{{ID: 0, Box: unit}, {ID: 1, Box: bx(v(0, 0, 1), v(1, 1, 2))}}, [][2]int32{{0, 1}}},
		{"one ulp apart on y", []Body{{ID: 0, Box: unit}, {ID: 1, Box: bx(v(0, gap, 0), v(1, 2, 1))}}, nil},
		{"tiny gap on y (the quick test's product underflows)", []Body{{ID: 0, Box: bx(v(0, 0, 0), v(1, 1e-200, 1))}, {ID: 1, Box: bx(v(0, 2e-200, 0), v(1, 3e-200, 1))}}, nil},
		{"tiny gap on z", []Body{{ID: 0, Box: bx(v(0, 0, 0), v(1, 1, 1e-200))}, {ID: 1, Box: bx(v(0, 0, 2e-200), v(1, 1, 3e-200))}}, nil},
		{"tiny boxes touching on y", []Body{{ID: 0, Box: bx(v(0, 0, 0), v(1, 1e-200, 1))}, {ID: 1, Box: bx(v(0, 1e-200, 0), v(1, 3e-200, 1))}}, [][2]int32{{0, 1}}},
		{"overlap on x and y only", []Body{{ID: 0, Box: unit}, {ID: 1, Box: bx(v(0.5, 0.5, 3), v(2, 2, 4))}}, nil},
		{"flat boxes (zero thickness) crossing", []Body{{ID: 0, Box: bx(v(0, 0, 0), v(2, 2, 0))}, {ID: 1, Box: bx(v(1, 1, 0), v(3, 3, 0))}}, [][2]int32{{0, 1}}},
		{"huge box around small ones", []Body{{ID: 0, Box: bx(v(-1e300, -1e300, -1e300), v(1e300, 1e300, 1e300))}, {ID: 1, Box: unit}, {ID: 2, Box: bx(v(5, 5, 5), v(6, 6, 6))}}, [][2]int32{{0, 1}, {0, 2}}},
		{"static infinite plane and dynamic boxes", []Body{{ID: 5, Box: everything, Kind: Static}, {ID: 1, Box: unit}, {ID: 2, Box: bx(v(1e9, -1e9, 7), v(1e9+1, -1e9+1, 8))}}, [][2]int32{{1, 5}, {2, 5}}},
		{"two static planes and a static box", []Body{{ID: 0, Box: everything, Kind: Static}, {ID: 1, Box: below, Kind: Static}, {ID: 2, Box: unit, Kind: Static}}, nil},
		{"half-space and boxes above and below", []Body{{ID: 0, Box: below, Kind: Static}, {ID: 1, Box: bx(v(0, 0, -1), v(1, 1, -0.5))}, {ID: 2, Box: bx(v(0, 0, 0), v(1, 1, 1))}, {ID: 3, Box: bx(v(0, 0, 0.1), v(1, 1, 1))}}, [][2]int32{{0, 1}, {0, 2}, {2, 3}}},
		{"infinite dynamic and a sleeping box", []Body{{ID: 0, Box: everything}, {ID: 1, Box: unit, Asleep: true}}, [][2]int32{{0, 1}}},
		{"sleeping box and plane", []Body{{ID: 0, Box: everything, Kind: Static}, {ID: 1, Box: unit, Asleep: true}}, nil},
		{"negative zero and zero", []Body{{ID: 0, Box: bx(v(-1, -1, -1), v(math.Copysign(0, -1), 0, 0))}, {ID: 1, Box: bx(v(0, 0, 0), v(1, 1, 1))}}, [][2]int32{{0, 1}}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for i := range tc.bodies {
				tc.bodies[i].Category, tc.bodies[i].Mask = AllBits, AllBits
			}
			if got := AllPairs(nil, tc.bodies); !slices.Equal(got, tc.want) {
				t.Errorf("AllPairs = %v, want %v", got, tc.want)
			}
			m := newMirror(t)
			for _, b := range tc.bodies {
				m.insert(b)
			}
			if got := m.s.Pairs(nil); !slices.Equal(got, tc.want) {
				t.Errorf("SAP.Pairs = %v, want %v", got, tc.want)
			}
			// Once more after a no-op step: the incremental path must agree.
			if got := m.s.Pairs(nil); !slices.Equal(got, tc.want) {
				t.Errorf("SAP.Pairs second call = %v, want %v", got, tc.want)
			}
		})
	}
}

// TestAxisChoice spreads a grid of boxes along one axis after another and
// checks that the sweep axis follows, with hysteresis, and that the pairs
// stay right throughout.
func TestAxisChoice(t *testing.T) {
	// A 3D grid of unit cubes with spacing sp[k] along axis k: the variance
	// of the centres along k is proportional to sp[k]^2, so the ratio of
	// variances of two axes is (sp[a]/sp[b])^2 exactly.
	const side = 10
	grid := func(m *mirror, sp shapes.Vec3, insert bool) {
		id := int32(0)
		for i := 0; i < side; i++ {
			for j := 0; j < side; j++ {
				for k := 0; k < side; k++ {
					c := shapes.Vec3{float64(i) * sp[0], float64(j) * sp[1], float64(k) * sp[2]}
					box := boxAt(c, shapes.Vec3{0.5, 0.5, 0.5})
					if insert {
						m.insert(Body{ID: id, Box: box, Category: AllBits, Mask: AllBits})
					} else {
						m.move(id, box)
					}
					id++
				}
			}
		}
	}
	// Each step sets the spacings and names the axis expected afterwards.
	// Switch threshold: axisSwitchRatio = 1.44 on the variance, that is a
	// factor 1.2 on the spacing.
	steps := []struct {
		sp   shapes.Vec3
		want int
		why  string
	}{
		{shapes.Vec3{3, 1, 1}, 0, "spread along x"},
		{shapes.Vec3{1, 3, 1}, 1, "spread along y"},
		{shapes.Vec3{1, 1.1, 1.15}, 1, "z only 1.15/1.1 (variance x1.09) ahead of y: keep y"},
		{shapes.Vec3{1, 1, 1.15}, 1, "z 1.15 times y (variance x1.32 < 1.44): keep y"},
		{shapes.Vec3{1, 1, 1.3}, 2, "z 1.3 times y (variance x1.69 > 1.44): switch"},
		{shapes.Vec3{1.1, 1, 1}, 2, "x 1.1 times z: keep z"},
		{shapes.Vec3{5, 1, 1}, 0, "x far ahead"},
	}
	m := newMirror(t)
	for i, st := range steps {
		grid(m, st.sp, i == 0)
		n := m.check(st.why)
		if n == 0 {
			t.Fatalf("%s: no pairs; the grid should touch along the unit-spaced axes", st.why)
		}
		if got := m.s.Axis(); got != st.want {
			t.Errorf("%s: axis %d, want %d (variances %v)", st.why, got, st.want, m.s.variance)
		}
	}
}

// TestDeterminism: the same operations give the same pairs, and so do the
// same bodies reached through a different history.
func TestDeterminism(t *testing.T) {
	build := func(seed uint64, shuffle bool) [][][2]int32 {
		rng := rand.New(rand.NewPCG(seed, 1))
		s := New()
		const n = 1500
		ids := make([]int32, n)
		for i := range ids {
			ids[i] = int32(i)
		}
		boxes := make([]shapes.AABB, n)
		for i := range boxes {
			c := shapes.Vec3{rng.Float64() * 25, rng.Float64() * 25, rng.Float64() * 25}
			boxes[i] = boxAt(c, shapes.Vec3{0.5, 0.5, 0.5})
		}
		order := rand.New(rand.NewPCG(seed+1000, 2))
		if shuffle {
			order.Shuffle(n, func(i, j int) { ids[i], ids[j] = ids[j], ids[i] })
			// A detour: insert half at a wrong place first and query once.
			for _, id := range ids[:n/2] {
				if err := s.Insert(id, boxAt(shapes.Vec3{-50, 80, 3}, shapes.Vec3{1, 1, 1}), Dynamic); err != nil {
					t.Fatal(err)
				}
			}
			s.Pairs(nil)
			for _, id := range ids[:n/2] {
				if err := s.Move(id, boxes[id]); err != nil {
					t.Fatal(err)
				}
			}
			for _, id := range ids[n/2:] {
				if err := s.Insert(id, boxes[id], Dynamic); err != nil {
					t.Fatal(err)
				}
			}
		} else {
			for _, id := range ids {
				if err := s.Insert(id, boxes[id], Dynamic); err != nil {
					t.Fatal(err)
				}
			}
		}
		var out [][][2]int32
		for step := 0; step < 4; step++ {
			out = append(out, s.Pairs(nil))
			for id := range boxes {
				d := shapes.Vec3{rng.Float64() - 0.5, rng.Float64() - 0.5, rng.Float64() - 0.5}
				boxes[id] = shapes.AABB{Min: boxes[id].Min.Add(d), Max: boxes[id].Max.Add(d)}
				if err := s.Move(int32(id), boxes[id]); err != nil {
					t.Fatal(err)
				}
			}
		}
		return out
	}
	a, b, c := build(9, false), build(9, false), build(9, true)
	for step := range a {
		if len(a[step]) == 0 {
			t.Fatalf("step %d: no pairs; the scene should be dense enough to have some", step)
		}
		if !slices.Equal(a[step], b[step]) {
			t.Errorf("step %d: two identical runs differ", step)
		}
		if !slices.Equal(a[step], c[step]) {
			t.Errorf("step %d: a different insertion history changes the pairs", step)
		}
	}
}

func TestAppendsToDst(t *testing.T) {
	s := New()
	box := shapes.AABB{Max: shapes.Vec3{1, 1, 1}}
	for id := int32(0); id < 3; id++ {
		if err := s.Insert(id, box, Dynamic); err != nil {
			t.Fatal(err)
		}
	}
	prefix := [][2]int32{{99, 100}}
	got := s.Pairs(prefix)
	want := [][2]int32{{99, 100}, {0, 1}, {0, 2}, {1, 2}}
	if !slices.Equal(got, want) {
		t.Errorf("Pairs(prefix) = %v, want %v", got, want)
	}
}

func TestReinsert(t *testing.T) {
	v := func(x float64) shapes.AABB { return boxAt(shapes.Vec3{x, 0, 0}, shapes.Vec3{0.5, 0.5, 0.5}) }
	m := newMirror(t)
	m.insert(Body{ID: 0, Box: v(0), Category: AllBits, Mask: AllBits})
	m.insert(Body{ID: 1, Box: v(0.5), Category: AllBits, Mask: AllBits})
	m.insert(Body{ID: 2, Box: v(10), Category: AllBits, Mask: AllBits})
	m.check("initial")
	// Remove 1 and insert it at once elsewhere, as static: it must behave
	// as the new body, not the old.
	m.remove(1)
	m.insert(Body{ID: 1, Box: v(10.5), Kind: Static, Category: AllBits, Mask: AllBits})
	if m.check("reinserted at once") != 1 {
		t.Errorf("want exactly the pair {1 2}")
	}
	// Remove, query, insert again.
	m.remove(2)
	if m.check("removed") != 0 {
		t.Errorf("want no pairs")
	}
	m.insert(Body{ID: 2, Box: v(1), Category: AllBits, Mask: AllBits})
	m.check("inserted again")
	// Insert then remove before any query.
	m.insert(Body{ID: 7, Box: v(0), Category: AllBits, Mask: AllBits})
	m.remove(7)
	m.check("inserted and removed between queries")
	if m.s.Len() != 3 {
		t.Errorf("Len = %d, want 3", m.s.Len())
	}
}

func TestErrors(t *testing.T) {
	s := New()
	ok := shapes.AABB{Max: shapes.Vec3{1, 1, 1}}
	if err := s.Insert(0, ok, Dynamic); err != nil {
		t.Fatal(err)
	}
	nan := ok
	nan.Max[1] = math.NaN()
	inverted := ok
	inverted.Min[2] = 2
	cases := []struct {
		name string
		err  error
		want error
	}{
		{"negative id", s.Insert(-1, ok, Dynamic), ErrBadID},
		{"id beyond MaxID", s.Insert(MaxID+1, ok, Dynamic), ErrBadID},
		{"duplicate", s.Insert(0, ok, Dynamic), ErrDuplicate},
		{"NaN box on insert", s.Insert(1, nan, Dynamic), ErrBadBox},
		{"min above max", s.Insert(1, inverted, Static), ErrBadBox},
		{"NaN box on move", s.Move(0, nan), ErrBadBox},
		{"move unknown", s.Move(5, ok), ErrUnknown},
		{"move negative", s.Move(-3, ok), ErrUnknown},
		{"remove unknown", s.Remove(5), ErrUnknown},
		{"sleep unknown", s.SetAsleep(5, true), ErrUnknown},
		{"filter unknown", s.SetFilter(5, 1, 1), ErrUnknown},
	}
	for _, tc := range cases {
		if !errors.Is(tc.err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, tc.err, tc.want)
		}
	}
	if err := s.Insert(1, ok, Kind(9)); err == nil {
		t.Errorf("unknown kind: no error")
	}
	if err := s.Remove(0); err != nil {
		t.Fatal(err)
	}
	if err := s.Remove(0); !errors.Is(err, ErrUnknown) {
		t.Errorf("remove twice: error %v, want %v", err, ErrUnknown)
	}
	if s.Len() != 0 || s.Contains(0) {
		t.Errorf("after failed calls: Len %d, Contains(0) %v; want 0, false", s.Len(), s.Contains(0))
	}
	// Failed calls must leave the broad phase usable.
	if got := s.Pairs(nil); len(got) != 0 {
		t.Errorf("pairs after errors: %v", got)
	}
}

// TestSteadyStateAllocs: once the buffers have grown, an update of every
// box and a query allocate nothing.
func TestSteadyStateAllocs(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	s := New()
	const n = 2000
	boxes := make([]shapes.AABB, n)
	for i := range boxes {
		c := shapes.Vec3{rng.Float64() * 30, rng.Float64() * 30, rng.Float64() * 30}
		boxes[i] = boxAt(c, shapes.Vec3{0.5, 0.5, 0.5})
		if err := s.Insert(int32(i), boxes[i], Dynamic); err != nil {
			t.Fatal(err)
		}
	}
	dst := s.Pairs(nil)
	phase := 0.0
	allocs := testing.AllocsPerRun(20, func() {
		phase += 0.1
		for i := range boxes {
			d := shapes.Vec3{0.05 * math.Sin(phase+float64(i)), 0.05 * math.Cos(phase+float64(i)), 0}
			s.Move(int32(i), shapes.AABB{Min: boxes[i].Min.Add(d), Max: boxes[i].Max.Add(d)})
		}
		dst = s.Pairs(dst[:0])
	})
	if len(dst) == 0 {
		t.Fatal("no pairs: the scene should have some")
	}
	if allocs != 0 {
		t.Errorf("%v allocations per step, want 0", allocs)
	}
}

// TestSortPairs checks both sorting paths (comparison and radix) against
// the standard library's sort, on pairs with many repeated first ids (as
// when a plane overlaps every body).
func TestSortPairs(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 3))
	cases := []struct {
		name    string
		pairs   int
		ids     int
		repeats bool
	}{
		{"few pairs, many ids (comparison)", 50, 10000, false},
		{"many pairs, few ids (radix)", 20000, 3000, false},
		{"one body in every pair (radix)", 5000, 5000, true},
		{"empty", 0, 10, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			s := New()
			s.slots = make([]slot, tc.ids)
			seg := make([][2]int32, tc.pairs)
			for i := range seg {
				a, b := int32(rng.IntN(tc.ids)), int32(rng.IntN(tc.ids))
				if tc.repeats {
					a = 0
				}
				seg[i] = [2]int32{min(a, b), max(a, b)}
			}
			want := slices.Clone(seg)
			slices.SortFunc(want, func(x, y [2]int32) int {
				if x[0] != y[0] {
					return int(x[0] - y[0])
				}
				return int(x[1] - y[1])
			})
			s.sortPairs(seg)
			if !slices.Equal(seg, want) {
				t.Errorf("sortPairs disagrees with slices.SortFunc (%s)", firstDiff(seg, want))
			}
		})
	}
}
