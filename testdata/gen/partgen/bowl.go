package partgen

import "math"

// Dimensions of the bowl feeder fixture bowl.stl, in millimetres: a bowl
// about the z axis whose floor is a shallow cone (BowlCone higher at the
// axis than at the wall, so that parts drift outward to the track), a wall
// of inner radius BowlRadius and height BowlWall, and a helical track
// BowlTrack wide along the inside of the wall that starts at the floor at
// angle 0 and rises counter-clockwise (seen from +z) by BowlRise over
// BowlTurn of a turn, then leaves the bowl as a straight chute BowlChute
// long, tangent to the helix and falling at BowlChuteSlope degrees (steep
// enough for parts to slide down it), through a gap in the wall from
// BowlGapFrom to BowlGapTo degrees. The track's underside is closed down
// to the floor by a wall at its inner edge, so parts cannot get under it.
const (
	BowlRadius     = 60.0
	BowlWall       = 24.0
	BowlCone       = 3.0
	BowlTrack      = 12.0
	BowlRise       = 12.0
	BowlTurn       = 0.5
	BowlChute      = 60.0
	BowlChuteSlope = 18.0
	BowlGapFrom    = 172.5
	BowlGapTo      = 225.0
	// BowlSegments is the number of segments per turn of the floor, the
	// wall and the helix.
	BowlSegments = 96
)

// Bowl is the geometry of feeder/bowl.stl: a fixture kept as triangles,
// so its surfaces need not close into a solid; every face points to where
// parts are.
func Bowl() *Mesh {
	s := &Mesh{}
	n := BowlSegments
	rim := polygon(n, BowlRadius)
	// Floor: a cone from the axis down to the wall's foot.
	foot := s.ring(rim, 0)
	s.disk(s.vert(0, 0, BowlCone), foot, true)
	// Wall, facing the axis, and its top.
	top := s.ring(rim, BowlWall)
	out := s.ring(polygon(n, BowlRadius+3), BowlWall)
	for i := range top {
		j := (i + 1) % n
		if a := 360 * float64(i) / float64(n); a >= BowlGapFrom && a < BowlGapTo {
			continue // the gap the chute leaves by
		}
		s.quad(foot[j], foot[i], top[i], top[j]) // facing the axis
		s.quad(top[i], out[i], out[j], top[j])
	}
	// The helix: steps of the same angle as the floor's segments.
	ri := BowlRadius - BowlTrack
	steps := int(math.Round(BowlTurn * float64(n)))
	var inner, outer, base []int
	for k := 0; k <= steps; k++ {
		a := 2 * math.Pi * float64(k) / float64(n)
		z := BowlRise * float64(k) / float64(steps)
		c, sn := math.Cos(a), math.Sin(a)
		inner = append(inner, s.vert(ri*c, ri*sn, z))
		outer = append(outer, s.vert(BowlRadius*c, BowlRadius*sn, z))
		// The inner edge's wall reaches down to the cone floor at radius ri.
		base = append(base, s.vert(ri*c, ri*sn, BowlCone*(1-ri/BowlRadius)-0.5))
	}
	for k := 0; k < steps; k++ {
		s.quad(inner[k], outer[k], outer[k+1], inner[k+1]) // track, facing up
		s.quad(base[k], inner[k], inner[k+1], base[k+1])   // inner wall, facing the axis
	}
	// The chute: straight on from the helix's end along its tangent,
	// falling.
	a := 2 * math.Pi * BowlTurn
	t := [2]float64{-math.Sin(a), math.Cos(a)}
	ie, oe := s.V[inner[steps]], s.V[outer[steps]]
	drop := BowlChute * math.Tan(BowlChuteSlope*math.Pi/180)
	i2 := s.vert(ie[0]+BowlChute*t[0], ie[1]+BowlChute*t[1], BowlRise-drop)
	o2 := s.vert(oe[0]+BowlChute*t[0], oe[1]+BowlChute*t[1], BowlRise-drop)
	s.quad(inner[steps], outer[steps], o2, i2)
	return s
}
