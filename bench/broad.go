package bench

import (
	"math/rand/v2"
	"testing"

	"clatter/collide/broad"
	"clatter/shapes"
)

func init() {
	Register(
		Benchmark{Name: "BroadPhase10k", Fn: BroadPhase10k, Baseline: "BroadPhaseAllPairs10k"},
		Benchmark{Name: "BroadPhaseAllPairs10k", Fn: BroadPhaseAllPairs10k},
		Benchmark{Name: "BroadPhaseCloud10k", Fn: BroadPhaseCloud10k, Baseline: "BroadPhaseCloudAllPairs10k"},
		Benchmark{Name: "BroadPhaseCloudAllPairs10k", Fn: BroadPhaseCloudAllPairs10k},
	)
}

// broadScene is a set of boxes, each drifting with its own constant
// velocity and turning back when it strays farther than broadWander from its
// home along an axis or its centre leaves the region: frame-to-frame coherent motion as in a simulation,
// with the same statistics at every step, so that runs of different length
// see the same scene.
type broadScene struct {
	boxes  []shapes.AABB
	home   []shapes.Vec3 // Min corner at the start
	vel    []shapes.Vec3
	region shapes.Vec3
}

// broadWander is how far a box strays from home along each axis: about two
// part sizes.
const broadWander = 2.0

// newBroadScene places n boxes with edge lengths 0.5 to 1.5 (mean 1) with
// centres at random in [0, region], each moving by up to speed per step
// along each axis.
func newBroadScene(n int, region shapes.Vec3, speed float64, seed uint64) *broadScene {
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	sc := &broadScene{boxes: make([]shapes.AABB, n), home: make([]shapes.Vec3, n), vel: make([]shapes.Vec3, n), region: region}
	for i := 0; i < n; i++ {
		for k := 0; k < 3; k++ {
			h := 0.25 + 0.5*rng.Float64()
			c := rng.Float64() * region[k]
			sc.boxes[i].Min[k], sc.boxes[i].Max[k] = c-h, c+h
			sc.vel[i][k] = speed * (2*rng.Float64() - 1)
		}
		sc.home[i] = sc.boxes[i].Min
	}
	return sc
}

// step moves every box.
func (sc *broadScene) step() {
	for i := range sc.boxes {
		b, v, h := &sc.boxes[i], &sc.vel[i], &sc.home[i]
		for k := 0; k < 3; k++ {
			b.Min[k] += v[k]
			b.Max[k] += v[k]
			d := b.Min[k] - h[k]
			c := 0.5 * (b.Min[k] + b.Max[k])
			if d > broadWander || d < -broadWander || c < 0 || c > sc.region[k] {
				v[k] = -v[k]
			}
		}
	}
}

// The benchmark scene: 10,000 parts of about unit size spread over a
// 300 x 300 floor in a layer three parts deep (parts on a tray or conveyor,
// about 11 percent of the floor covered), each moving up to 1 percent of its
// size per step along each axis (0.1 m/s for a 10 mm part at 1 ms steps).
const (
	broadN     = 10000
	broadSpeed = 0.01
	broadSeed  = 1
)

var broadRegion = shapes.Vec3{300, 300, 3}

// broadCloudRegion is a cube holding the same parts at about the same
// volume fraction (4 percent): the hard case for a one-axis sweep.
var broadCloudRegion = shapes.Vec3{62, 62, 62}

// BroadPhase10k measures one step of the sweep-and-prune broad phase on the
// floor scene: Move of every body, then Pairs.
func BroadPhase10k(b *testing.B) { benchSAP(b, broadRegion) }

// BroadPhaseCloud10k is BroadPhase10k with the parts in a cube.
func BroadPhaseCloud10k(b *testing.B) { benchSAP(b, broadCloudRegion) }

func benchSAP(b *testing.B, region shapes.Vec3) {
	sc := newBroadScene(broadN, region, broadSpeed, broadSeed)
	s := broad.New()
	for i, box := range sc.boxes {
		if err := s.Insert(int32(i), box, broad.Dynamic); err != nil {
			b.Fatal(err)
		}
	}
	dst := s.Pairs(nil)
	dst = make([][2]int32, 0, 2*len(dst)+1024) // room for the count to vary
	pairs := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		sc.step()
		for id, box := range sc.boxes {
			if err := s.Move(int32(id), box); err != nil {
				b.Fatal(err)
			}
		}
		dst = s.Pairs(dst[:0])
		pairs += len(dst)
	}
	b.StopTimer() // ReportMetric allocates; keep it out of allocs/op
	b.ReportMetric(float64(pairs)/float64(b.N), "pairs/op")
}

// BroadPhaseAllPairs10k is BroadPhase10k done by brute force, testing all
// 50 million pairs each step (the reference).
func BroadPhaseAllPairs10k(b *testing.B) { benchAllPairs(b, broadRegion) }

// BroadPhaseCloudAllPairs10k is BroadPhaseAllPairs10k on the cube scene.
func BroadPhaseCloudAllPairs10k(b *testing.B) { benchAllPairs(b, broadCloudRegion) }

func benchAllPairs(b *testing.B, region shapes.Vec3) {
	sc := newBroadScene(broadN, region, broadSpeed, broadSeed)
	bodies := make([]broad.Body, len(sc.boxes))
	for i, box := range sc.boxes {
		bodies[i] = broad.Body{ID: int32(i), Box: box, Category: broad.AllBits, Mask: broad.AllBits}
	}
	dst := broad.AllPairs(nil, bodies)
	dst = make([][2]int32, 0, 2*len(dst)+1024)
	pairs := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		sc.step()
		for id, box := range sc.boxes {
			bodies[id].Box = box
		}
		dst = broad.AllPairs(dst[:0], bodies)
		pairs += len(dst)
	}
	b.StopTimer() // ReportMetric allocates; keep it out of allocs/op
	b.ReportMetric(float64(pairs)/float64(b.N), "pairs/op")
}
