package bench

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"clatter/engine"
	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

func init() {
	for _, n := range pourSizes {
		Register(Benchmark{Name: fmt.Sprintf("Pour%d", n), Fn: pourBench(n), Series: "Pour", Size: n})
	}
}

// pourSizes are the body counts of the Pour benchmarks; the table runner
// fits the exponent of their time per step against the count.
var pourSizes = []int{1000, 2000, 4000, 8000}

// The pour's timing window: each pour is stepped pourLead steps from
// release untimed, then through a window of pourWindow steps of which the
// timed ones are spread evenly (all of them when b.N asks for a window's
// worth or more; a larger b.N pours again from a new world; steps after the
// last timed one are not run). So whatever b.N, the figure is the mean
// over steps 0.1 s to 0.25 s after release: the bottom layers have landed
// and are being struck, the upper ones are still falling onto them (the top
// layer, 0.35 m up, lands about 0.25 s after release).
const (
	pourLead   = 100
	pourWindow = 150
	pourStep   = 1e-3 // s
)

// Pour1000 is one 1 ms step of 1000 mixed convex parts (boxes, cylinders
// and 40-vertex hulls, as in Pile1000) poured into the same 0.5 m bin:
// released from rest in 11 x 11 columns, 8 to 9 layers high, and measured
// while they fall and land (see pourLead). 8 velocity iterations, no
// sleeping. It reports the fraction of parts moving faster than 5 cm/s at
// the start of the window, and the CPU time per step.
func Pour1000(b *testing.B) { pour(b, 1000) }

func pourBench(n int) func(*testing.B) {
	if n == 1000 {
		return Pour1000
	}
	return func(b *testing.B) { pour(b, n) }
}

func pour(b *testing.B, n int) {
	b.ReportAllocs()
	b.StopTimer()
	pours := (b.N + pourWindow - 1) / pourWindow
	moving := 0.0
	var cpu cpuClock
	for p := 0; p < pours; p++ {
		timed := b.N*(p+1)/pours - b.N*p/pours // this pour's share of b.N
		w := pourWorld(b, n)
		for s := 0; s < pourLead; s++ {
			if err := w.Step(pourStep); err != nil {
				b.Fatal(err)
			}
		}
		moving += movingFraction(w, 0.05)
		for k, s := 0, 0; k < timed; s++ {
			on := s == (2*k+1)*pourWindow/(2*timed) // the middle of the k-th of timed equal spans
			if on {
				b.StartTimer()
				cpu.start()
			}
			if err := w.Step(pourStep); err != nil {
				b.Fatal(err)
			}
			if on {
				cpu.stop()
				b.StopTimer()
				k++
			}
		}
	}
	b.ReportMetric(moving/float64(pours), "moving")
	cpu.report(b)
}

// pourGrid returns the columns of a pour of n parts along x and y: 11 x 11
// for 1000, and for the other sizes of pourSizes a grid of the same number
// of layers (n/121 per column), so that parts per floor area are equal.
func pourGrid(n int) (kx, ky int) {
	cols := int(math.Round(float64(n) * 121 / 1000))
	kx = int(math.Round(math.Sqrt(float64(cols))))
	for kx > 1 && cols%kx != 0 {
		kx--
	}
	return kx, cols / kx
}

// pourWorld places n parts in the columns of pourGrid, 4 cm apart (none
// touching), at seeded random orientations, above a floor between four
// walls whose spacing grows with the grid (0.5 m for 11 columns).
func pourWorld(b *testing.B, n int) *engine.World {
	kx, ky := pourGrid(n)
	w, mat, add := binWorld(b, 0.25*float64(kx)/11, 0.25*float64(ky)/11)
	rng := rand.New(rand.NewPCG(1000, 2))
	parts := []*shapes.Hull{randomPart(rng, 40), randomPart(rng, 40), randomPart(rng, 40)}
	x0, y0 := -0.02*float64(kx-1), -0.02*float64(ky-1)
	for i := 0; i < n; i++ {
		col, layer := i%(kx*ky), i/(kx*ky)
		pos := shapes.Vec3{x0 + 0.04*float64(col%kx), y0 + 0.04*float64(col/kx), 0.03 + 0.04*float64(layer)}
		q := mgl64.QuatRotate(rng.Float64()*math.Pi, shapes.Vec3{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}.Normalize())
		add(engine.BodyDef{Name: "part", Shape: mixedPart(i, parts), Density: 1050, Material: mat, Position: pos, Orientation: q})
	}
	return w
}

// movingFraction is the fraction of dynamic bodies faster than v (m/s).
func movingFraction(w *engine.World, v float64) float64 {
	moving, dynamic := 0, 0
	for id := engine.BodyID(0); int(id) < w.NumBodies(); id++ {
		if w.KindOf(id) != engine.Dynamic {
			continue
		}
		dynamic++
		if w.Velocity(id).Len() > v {
			moving++
		}
	}
	return float64(moving) / float64(max(dynamic, 1))
}
