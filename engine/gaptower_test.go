package engine

import (
	"fmt"
	"testing"

	"clatter/shapes"
)

func TestGappedTowersLand(t *testing.T) {
	// A tower of boxes set down with a small gap under each box lands on
	// itself and is then at rest like one built touching (statics: each box
	// rests on the one below, which carries the weight of all above it;
	// J. L. Meriam and L. G. Kraige, "Engineering Mechanics: Statics",
	// chapter 3). Each box falls its gaps straight down: with every box
	// starting at rest and square on the one below, nothing pushes it
	// sideways or turns it. standTower holds each box to the tall towers'
	// bounds: sideways within a thousandth of its width (38 um here), down
	// by at most the slop per face below it, at rest, and each face
	// carrying the weight above it within towerLoadTol.
	//
	// The boxes are 47 x 38 x 18 mm of density 730 kg/m^3 (a packaged
	// part), each 0.47 mm (1 percent of its length) above the one below.
	// Before the banded solve took in gaps within the bodies' depth
	// (contact/bandnear.go), no point of such a tower touched at its first
	// step, none was solved directly, and at 1/30 s towers of 10 to 20 boxes
	// leaned by up to 1.4e-2 rad with their top box 2-4 mm sunk into the
	// boxes below, and 30 fell (measured).
	half := shapes.Vec3{0.0235, 0.019, 0.009}
	part := [2]float64{730, 730}
	const gap = 0.47e-3
	var cases []towerCase
	for _, dt := range []float64{1.0 / 30, 1.0 / 120, 1e-3} {
		for _, n := range []int{10, 20, 30} {
			cases = append(cases, towerCase{name: fmt.Sprintf("%d boxes, dt %.3g s", n, dt),
				n: n, half: half, dense: part, dt: dt, rest: 0.5, gap: gap, seconds: 1})
		}
		// Restitution at rest is no impact, whether the boxes bounce
		// little or much on landing; a tower built touching stands too.
		for _, e := range []float64{0, 0.9} {
			cases = append(cases, towerCase{name: fmt.Sprintf("20 boxes, restitution %g, dt %.3g s", e, dt),
				n: 20, half: half, dense: part, dt: dt, rest: e, gap: gap, seconds: 1})
		}
		cases = append(cases, towerCase{name: fmt.Sprintf("30 boxes touching, dt %.3g s", dt),
			n: 30, half: half, dense: part, dt: dt, rest: 0.5, seconds: 1})
	}
	// The same tower scaled down 20 times (2.35 mm parts), gaps of 1 and
	// 5 percent of the length: motion under gravity has no length scale of
	// its own, so it must land the same (before the fix, 12 and 20 of them
	// fell over at 1/30 s and 1/60 s, measured).
	small := half.Mul(0.05)
	for _, dt := range []float64{1.0 / 30, 1.0 / 60} {
		for _, f := range []float64{0.01, 0.05} {
			for _, n := range []int{12, 20} {
				cases = append(cases, towerCase{name: fmt.Sprintf("%d parts of 2.35 mm, gap %g, dt %.3g s", n, f, dt),
					n: n, half: small, dense: part, dt: dt, rest: 0.5, gap: f * 2 * small[0], seconds: 1})
			}
		}
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { standTower(t, c) })
	}
}
