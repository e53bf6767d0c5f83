package verify

import (
	"fmt"
	"math"

	"clatter/engine"
	"clatter/engine/scene"
)

// feederCases are the counting-gate and vibratory-feeder cases.
func feederCases() []Case {
	return []Case{
		{
			Name: "parts 40 mm apart on a belt at 200 mm/s: gate rate", Unit: "per minute",
			Reference: "rate = v / spacing = 300 per minute", Source: "kinematics of a conveyor (parts ride with the belt)",
			Relative: true, Tolerance: 0.01,
			Why: "rate from the first to the last of 7 crossings over 1.2 s, each interpolated within a 1 ms step",
			Run: gateRate,
		},
		{
			Name: "conveying speed on a 3 deg track at throw number 1.2", Unit: "mm/s",
			Reference: "particle model of sliding and hopping, stepped finely", Source: "Redford and Boothroyd, Vibratory feeding, Proc. IMechE 182 (1967)",
			Tolerance: 3,
			Why:       "3 percent of the track's peak speed of 103 mm/s: the part is a box that rocks as it lands, not a particle",
			Run:       conveyingSpeed,
		},
	}
}

// beltScene carries 7 cubes 40 mm apart on a belt at 200 mm/s through a gate.
func beltScene() string {
	s := `units = { length = "mm", mass = "g" }
[world]
duration = 1.5
until_settled = false
[[body]]
name = "belt"
static = true
shape = { box = [4000, 100, 10] }
position = [0, 0, -5]
[[drive]]
body = "belt"
conveyor = [200, 0, 0]
[[gate]]
name = "count"
at = [0, 0, 0]
normal = [1, 0, 0]
`
	for i := 0; i < 7; i++ {
		s += fmt.Sprintf("[[body]]\nname = \"c%d\"\nshape = { box = [10, 10, 10] }\ndensity = 1e-3\nposition = [%d, 0, 5]\nvelocity = [200, 0, 0]\n", i, -30-40*i)
	}
	return s
}

func gateRate() (float64, float64, float64, error) {
	s, err := scene.Parse([]byte(beltScene()), "verify-belt.toml", scene.Options{})
	if err != nil {
		return 0, 0, 0, err
	}
	w, _, err := s.Build()
	if err != nil {
		return 0, 0, 0, err
	}
	var times []float64
	for w.Time() < s.World.Duration {
		if err := w.Step(s.World.Step); err != nil {
			return 0, 0, 0, err
		}
		for _, c := range w.Crossings() {
			times = append(times, c.Time)
		}
	}
	if len(times) != 7 {
		return 300, math.NaN(), math.NaN(), fmt.Errorf("counted %d parts, want 7", len(times))
	}
	return 300, 60 * 6 / (times[6] - times[0]), math.NaN(), nil
}

func conveyingSpeed() (float64, float64, float64, error) {
	alpha, psi, w := 3*math.Pi/180, 20*math.Pi/180, 2*math.Pi*50
	const throw, mu = 1.2, 0.5
	amp := throw * g * math.Cos(alpha) / (w * w * math.Sin(psi))
	src := fmt.Sprintf(`units = { length = "mm", mass = "g" }
[world]
step = "0.1 ms"
duration = 1.3
until_settled = false
[material.steel]
friction = %g
[[body]]
name = "track"
driven = true
shape = { box = [1000, 100, 10] }
material = "steel"
orientation = { axis = [0, 1, 0], angle = -3 }
[[drive]]
body = "track"
vibration = [{ along = [%.12g, 0, %.12g], amplitude = %.12g, frequency = "50 Hz" }]
[[body]]
name = "part"
shape = { box = [10, 10, 4] }
material = "steel"
density = "7.8 g/cm3"
position = [0, 0, 7]
orientation = { axis = [0, 1, 0], angle = -3 }
`, mu, math.Cos(alpha+psi), math.Sin(alpha+psi), amp*1000)
	sum, err := runScene(src, "verify-track.toml")
	if err != nil {
		return 0, 0, 0, err
	}
	if len(sum.Drives) != 1 || sum.Drives[0].ConveyingSpeed == nil {
		return 0, 0, 0, fmt.Errorf("no conveying speed measured")
	}
	// Over the cycles after the first second, as the summary measures.
	want := engine.ConveyingSpeedModel(alpha, psi, mu, 50, amp, g, 50, 15) * 1000
	return want, *sum.Drives[0].ConveyingSpeed, math.NaN(), nil
}
