package engine

import (
	"math"
	"testing"

	"clatter/shapes"

	"github.com/go-gl/mathgl/mgl64"
)

// A flat part that lands on its face while sliding (and turning) must feel
// its face's whole friction from the step it lies flat. Coulomb's law: a
// body sliding on a level floor decelerates at mu g and, from speed v1,
// stops after v1^2/(2 mu g) at v1/(mu g) later (J. L. Meriam and L. G.
// Kraige, "Engineering Mechanics: Dynamics", any edition, rectilinear
// motion with constant acceleration). Sliding and turning together, the
// friction of a uniformly pressed patch opposes the generalised slip, and
// both motions end at the same instant (Goyal, Ruina and Papadopoulos,
// "Planar sliding with dry friction", Wear 143, 1991).
//
// The part lands tilted, one corner first, and settles onto its face; for
// some steps after that the patch's first point stays a hair above the
// floor. The direct solve after unconverged sweeps released the sliding
// patch's friction and kept it at zero while that point pressed nothing,
// and the part glided on its face (contact/blockrows.go, holds).

// Tolerances of the landing slides.
const (
	// tolFaceDecel: the per-step fall of the speed of a part sliding on its
	// face against mu g dt. A steady slip on a uniformly loaded face is
	// solved to about 1e-9 (measured); a part that came to lie within its
	// slop on one edge of its face carries its load unevenly and turns a
	// little as it slides, which takes up to 2.5 percent of its friction
	// from the slide (measured on the cases here). A step without friction
	// is off by 1.
	tolFaceDecel = 0.05
	// tolFaceStop: the distance and time from the first flat step to the
	// stop against v1^2/(2 mu g) and v1/(mu g), with the same allowance for
	// an uneven load; the stop itself falls within one step, so v1 dt of
	// distance and dt of time are added to the bound.
	tolFaceStop = 0.03
	// flatSpeed (m/s): the part lies flat on its face once its centre and
	// the edges of its face move vertically slower than this, a millimetre
	// a second: the landing's motions are hundreds of times faster.
	flatSpeed = 1e-3
)

// landing is a box landing on its largest face while sliding along x and
// turning about the vertical.
type landing struct {
	name       string
	half       shapes.Vec3 // half-extents (m), the face down is x by y
	drop       float64     // m, the centre above its height lying flat
	tilt       float64     // rad, about axis
	axis       shapes.Vec3 // tilt axis in the floor's plane
	v0, w0, mu float64     // m/s, rad/s, kinetic = static coefficient
	dt         float64
}

// landAndSlide runs c and returns, from the first step the part lies flat,
// the speed v1, the largest relative error of a step's fall in speed
// against mu g dt while it slides straight (w0 = 0) faster than a tenth of
// v1, the distance and time to the stop of sliding, and the time to the
// stop of turning.
func landAndSlide(t *testing.T, c landing) (v1, w1, decelErr, dist, tSlide, tSpin float64) {
	t.Helper()
	cfg := DefaultConfig()
	cfg.NoSleep = true
	w, mat := floorWorld(t, cfg, 0, Material{Friction: c.mu})
	q := mgl64.QuatRotate(c.tilt, c.axis.Normalize())
	id := mustAdd(t, w, BodyDef{Name: "box", Shape: shapes.Box{Half: c.half}, Density: 1000, Material: mat,
		Position: shapes.Vec3{0, 0, c.half[2] + c.drop}, Orientation: q,
		Velocity: shapes.Vec3{c.v0, 0, 0}, Spin: shapes.Vec3{0, 0, c.w0}})
	t1 := -1.0
	var p1 shapes.Vec3
	tSlide, tSpin = math.NaN(), math.NaN()
	prev := 0.0
	for i := 0; i < int(math.Round(3/c.dt)); i++ {
		if err := w.Step(c.dt); err != nil {
			t.Fatal(err)
		}
		v, wz := w.Velocity(id), w.Spin(id)[2]
		speed := math.Hypot(v[0], v[1])
		rock := math.Hypot(w.Spin(id)[0], w.Spin(id)[1]) * math.Hypot(c.half[0], c.half[1])
		if t1 < 0 {
			if i > 0 && rock < flatSpeed && math.Abs(v[2]) < flatSpeed {
				t1, p1, v1, w1 = w.Time(), w.Position(id), speed, wz
			}
			prev = speed
			continue
		}
		if c.w0 == 0 && speed > 0.1*v1 && prev > 0.1*v1 {
			decelErr = max(decelErr, math.Abs((prev-speed)/(c.mu*g0*c.dt)-1))
		}
		prev = speed
		if math.IsNaN(tSlide) && speed < 1e-3*c.v0 {
			p := w.Position(id)
			tSlide, dist = w.Time()-t1, math.Hypot(p[0]-p1[0], p[1]-p1[1])
		}
		if math.IsNaN(tSpin) && math.Abs(wz) < 1e-3*max(c.w0, 1) {
			tSpin = w.Time() - t1
		}
		if !math.IsNaN(tSlide) && !math.IsNaN(tSpin) {
			break
		}
	}
	if t1 < 0 {
		t.Fatalf("the part never lay flat")
	}
	return v1, w1, decelErr, dist, tSlide, tSpin
}

var landings = []landing{
	{"200x120 mm plate, 1/60 s, mu 0.15", shapes.Vec3{0.1, 0.06, 0.02}, 0, 0.02, shapes.Vec3{0.3, 1, 0}, 0.3, 0, 0.15, 1.0 / 60},
	{"100 mm square, 1 ms, mu 0.4", shapes.Vec3{0.05, 0.05, 0.01}, 0.001, 0.02, shapes.Vec3{0.3, 1, 0}, 0.6, 0, 0.4, 1e-3},
	{"40x30 mm tile, 1/60 s, mu 0.4", shapes.Vec3{0.02, 0.015, 0.005}, 0.005, 0.02, shapes.Vec3{1, 0.7, 0}, 0.3, 0, 0.4, 1.0 / 60},
}

var turningLandings = []landing{
	{"100 mm square, 1/60 s", shapes.Vec3{0.05, 0.05, 0.01}, 0.001, 0.02, shapes.Vec3{0.3, 1, 0}, 0.3, 10, 0.4, 1.0 / 60},
	{"100 mm square, 1/60 s, other tilt", shapes.Vec3{0.05, 0.05, 0.01}, 0.001, 0.003, shapes.Vec3{1, 0.7, 0}, 0.3, 10, 0.4, 1.0 / 60},
	{"100 mm square, 1 ms", shapes.Vec3{0.05, 0.05, 0.01}, 0.001, 0.02, shapes.Vec3{0.3, 1, 0}, 0.3, 10, 0.4, 1e-3},
	{"40x30 mm tile, 1/60 s, mu 0.15", shapes.Vec3{0.02, 0.015, 0.005}, 0.005, 0.02, shapes.Vec3{1, 0.7, 0}, 0.3, 10, 0.15, 1.0 / 60},
}

func TestLandedFaceSlidesToStop(t *testing.T) {
	for _, c := range landings {
		t.Run(c.name, func(t *testing.T) {
			v1, _, de, dist, tSlide, _ := landAndSlide(t, c)
			t.Logf("flat at %.4f m/s; deceleration off by %.3g; slid %.5f m in %.4f s", v1, de, dist, tSlide)
			if !(de <= tolFaceDecel) {
				t.Errorf("a step's deceleration is off mu g by %.3g, want within %g", de, tolFaceDecel)
			}
			want, wantT := v1*v1/(2*c.mu*g0), v1/(c.mu*g0)
			if d := math.Abs(dist - want); !(d <= tolFaceStop*want+v1*c.dt) {
				t.Errorf("slid %.5f m after lying flat, want %.5f m (v1^2/(2 mu g))", dist, want)
			}
			if d := math.Abs(tSlide - wantT); !(d <= tolFaceStop*wantT+c.dt) {
				t.Errorf("stopped %.4f s after lying flat, want %.4f s (v1/(mu g))", tSlide, wantT)
			}
		})
	}
}

func TestLandedFaceStopsTurningAndSliding(t *testing.T) {
	for _, c := range turningLandings {
		t.Run(c.name, func(t *testing.T) {
			v1, w1, _, dist, tSlide, tSpin := landAndSlide(t, c)
			t.Logf("flat at %.4f m/s; slid %.5f m; sliding stopped at %.4f s, turning at %.4f s", v1, dist, tSlide, tSpin)
			if math.IsNaN(tSlide) || math.IsNaN(tSpin) {
				t.Fatalf("still moving after 3 s: slide stop %v s, turn stop %v s", tSlide, tSpin)
			}
			ref := max(tSlide, tSpin)
			if d := math.Abs(tSlide - tSpin); !(d <= tolTogether*ref+2*c.dt) {
				t.Errorf("sliding stopped at %.4f s, turning at %.4f s after lying flat: want together", tSlide, tSpin)
			}
			// Turning adds nothing to the friction's magnitude, only turns
			// it: the slide ends no sooner than a pure slide from v1 would.
			if lo := v1 / (c.mu * g0); !(tSlide >= lo*(1-tolFaceStop)-c.dt) {
				t.Errorf("sliding stopped %.4f s after lying flat, sooner than mu g allows from %.4f m/s (%.4f s)", tSlide, v1, lo)
			}
			// Nor later than the face's friction at its limit, mu m g over
			// the generalised slip s = |(v, r w)|, can take the kinetic
			// energy E1 it lay flat with: it takes it at mu m g s, and
			// E <= M s^2/2 with M = max(m, I/r^2), so sqrt(E) falls at least
			// at mu m g / sqrt(2 M) (the limit surface of Goyal, Ruina and
			// Papadopoulos 1991, taken as the ellipsoid of Howe and Cutkosky,
			// "Practical force-motion models for sliding manipulation", IJRR
			// 15(6), 1996). Per unit mass: I/m = (a^2 + b^2)/3 for a box of
			// half-sides a, b (any dynamics handbook).
			im := (c.half[0]*c.half[0] + c.half[1]*c.half[1]) / 3
			r := meanDistance(c.half[0], c.half[1])
			M := max(1, im/(r*r))
			e1 := v1*v1/2 + im*w1*w1/2
			hi := math.Sqrt(2*M*e1) / (c.mu * g0)
			t.Logf("at %.3f rad/s; the friction's bound on the stop %.4f s", w1, hi)
			if !(tSlide <= hi*(1+tolFaceStop)+2*c.dt) {
				t.Errorf("sliding stopped %.4f s after lying flat at %.4f m/s and %.3f rad/s, later than the face's friction allows (%.4f s)", tSlide, v1, w1, hi)
			}
		})
	}
}

// meanDistance is the mean distance from the centre over a rectangle of
// half-sides a, b: the effective friction radius of a uniformly pressed
// rectangular face (Goyal, Ruina and Papadopoulos 1991), by the midpoint
// rule on a 200 x 200 grid (within 1e-5 of the closed form for a square,
// a (sqrt 2 + ln(1 + sqrt 2)) / 6 for side a).
func meanDistance(a, b float64) float64 {
	const n = 200
	sum := 0.0
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			x, y := a*(2*(float64(i)+0.5)/n-1), b*(2*(float64(j)+0.5)/n-1)
			sum += math.Hypot(x, y)
		}
	}
	return sum / (n * n)
}
