package scene

import (
	"fmt"
	"math"
	"testing"

	"clatter/shapes"
)

// unitSameTol: the final positions of a scene written in mm and g against
// the same scene in m and kg, as a fraction of the size of the part. The
// two files differ only in how their numbers round when they are turned
// into SI (100 mm x 0.001 against 0.1 m, one ulp); a bounce and a landing
// amplify that by a few orders at most, so 1e-9 of the part is rounding,
// and anything that depended on the unit of the file would show at 1e-3
// or more.
const unitSameTol = 1e-9

// unitSettledTol (s): the two runs settle at the same step; the times are
// sums of the same steps, equal to their rounding.
const unitSettledTol = 1e-9

// unitSameScene writes the same scene in the units of length lu (m per
// unit) and mass mu (kg per unit): a ball with e = 0.6 dropped 150 mm, a
// tilted box dropped onto its edge, and a stack of three boxes, at the
// part sizes of factor k.
func unitSameScene(lu, mu, k float64, unitLine string) string {
	L := func(x float64) string { return fmt.Sprint(x * k / lu) }
	dens := fmt.Sprint(1050 / mu * lu * lu * lu)
	body := func(name, shape, pos, extra string) string {
		return fmt.Sprintf("[[body]]\nname = %q\nshape = %s\nmaterial = \"abs\"\ndensity = %s\nposition = %s\n%s\n", name, shape, dens, pos, extra)
	}
	s := unitLine + `
[world]
step = 0.0005
duration = 4

[material.abs]
friction = 0.4
restitution = 0.6

[[body]]
name = "floor"
shape = { plane = [0, 0, 1] }
static = true
material = "abs"
position = [0, 0, 0]

`
	s += body("ball", fmt.Sprintf("{ sphere = %s }", L(0.02)), fmt.Sprintf("[0, 0, %s]", L(0.17)), "")
	s += body("box", fmt.Sprintf("{ box = [%s, %s, %s] }", L(0.06), L(0.04), L(0.03)), fmt.Sprintf("[%s, 0, %s]", L(0.3), L(0.1)),
		"orientation = { axis = [1, 2, 0], angle = 35 }")
	for i := 0; i < 3; i++ {
		s += body(fmt.Sprint("layer", i), fmt.Sprintf("{ box = [%s, %s, %s] }", L(0.05), L(0.05), L(0.02)),
			fmt.Sprintf("[%s, 0, %s]", L(-0.3), L(0.01+0.0202*float64(i))), "")
	}
	return s
}

func TestSameSceneInMillimetresAndMetres(t *testing.T) {
	// A scene's units are only how its numbers are written: the same scene
	// in mm and g and in m and kg is one physical case and must give the
	// same motion (to rounding), at any size of its parts.
	for _, k := range []float64{0.05, 1, 10} {
		t.Run(fmt.Sprint("parts x", k), func(t *testing.T) {
			type end struct {
				pos     []shapes.Vec3
				settled float64
			}
			runIt := func(src string) end {
				s, err := Parse([]byte(src), "same.toml", Options{})
				if err != nil {
					t.Fatal(err)
				}
				w, ids, err := s.Build()
				if err != nil {
					t.Fatal(err)
				}
				for w.Time() < s.World.Duration {
					if err := w.Step(s.World.Step); err != nil {
						t.Fatal(err)
					}
					if ok, _ := w.Settled(); ok {
						break
					}
				}
				var e end
				for i, b := range s.Bodies {
					if !b.Static {
						e.pos = append(e.pos, w.Position(ids[i]))
					}
				}
				_, e.settled = w.Settled()
				return e
			}
			si := runIt(unitSameScene(1, 1, k, ""))
			mm := runIt(unitSameScene(1e-3, 1e-3, k, `units = { length = "mm", mass = "g" }`))
			size := 0.02 * k
			for i := range si.pos {
				if d := si.pos[i].Sub(mm.pos[i]).Len() / size; !(d <= unitSameTol) {
					t.Errorf("body %d: at %v m in m/kg, at %v m in mm/g: differs by %.3g of its size, more than %g", i, si.pos[i], mm.pos[i], d, unitSameTol)
				}
			}
			if math.Abs(si.settled-mm.settled) > unitSettledTol {
				t.Errorf("settled at %g s in m/kg, at %g s in mm/g", si.settled, mm.settled)
			}
			t.Logf("settled at %g s (mm/g %g s); ball at %v m", si.settled, mm.settled, si.pos[0])
		})
	}
}
