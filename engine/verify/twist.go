package verify

import (
	"math"

	"clatter/engine"
	"clatter/shapes"
)

// twistCases are the cases of friction against twisting (patch friction).
func twistCases() []Case {
	return []Case{
		{
			Name: "disc of R 0.1 m spinning at 40 rad/s on a floor stops, mu 0.3", Unit: "s",
			Reference: "t = 3 omega0 R / (4 mu g)", Source: "uniform pressure over the disc: friction moment mu m g 2R/3 (Goyal, Ruina and Papadopoulos, Wear 143, 1991)",
			Relative: true, Tolerance: 0.02,
			Why: "the spin falls at a constant rate, exact per step; the stop is resolved to one 1 ms step of 1.02 s",
			Run: discSpinDown,
		},
		{
			Name: "square plate of 0.2 m spinning at 30 rad/s stops, mu 0.3", Unit: "s",
			Reference: "t = omega0 (a^2/6) / (mu g r), r = a (sqrt 2 + ln(1 + sqrt 2)) / 6", Source: "uniform pressure over the square: r is its mean distance from the centre (Goyal, Ruina and Papadopoulos 1991)",
			Relative: true, Tolerance: 0.02,
			Why: "as for the disc: a constant rate per step and the stop resolved to one 1 ms step of 0.89 s",
			Run: squareSpinDown,
		},
	}
}

func discSpinDown() (float64, float64, float64, error) {
	const r, mu, om = 0.1, 0.3, 40.0
	got, err := spinDown(shapes.Cylinder{Radius: r, HalfLength: 0.01}, 0.01, mu, om)
	return 3 * om * r / (4 * mu * g), got, math.NaN(), err
}

func squareSpinDown() (float64, float64, float64, error) {
	const a, mu, om = 0.2, 0.3, 30.0
	got, err := spinDown(shapes.Box{Half: shapes.Vec3{a / 2, a / 2, 0.005}}, 0.005, mu, om)
	reff := a * (math.Sqrt2 + math.Log(1+math.Sqrt2)) / 6
	return om * (a * a / 6) / (mu * g * reff), got, math.NaN(), err
}

// spinDown sets flat part s (centre height h) spinning at om on a floor
// and returns the time its spin takes to stop.
func spinDown(s shapes.Shape, h, mu, om float64) (float64, error) {
	cfg := engine.DefaultConfig()
	cfg.NoSleep = true
	w, mat, err := floorWorld(cfg, 0, engine.Material{Friction: mu})
	if err != nil {
		return 0, err
	}
	id, err := w.AddBody(engine.BodyDef{Name: "plate", Shape: s, Density: 1000, Material: mat, Position: shapes.Vec3{0, 0, h}})
	if err != nil {
		return 0, err
	}
	if err := steps(w, dt, seconds(0.05, dt), nil); err != nil { // let the contact form
		return 0, err
	}
	w.SetVelocity(id, shapes.Vec3{}, shapes.Vec3{0, 0, om})
	t0, stop := w.Time(), math.NaN()
	err = steps(w, dt, seconds(3, dt), func() {
		if math.IsNaN(stop) && w.Spin(id)[2] < 1e-3*om {
			stop = w.Time() - t0
		}
	})
	return stop, err
}
