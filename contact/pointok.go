package contact

import "math"

// pointOK reports, cheaply, that point p passes every test of check: its
// bodies in [0, n) and distinct, a unit normal, and every number finite
// with a patch radius >= 0. A false leaves the verdict, and the message,
// to the tests of check. The numbers are tested by one sum: a NaN or an
// infinity among them leaves the sum NaN or infinite, and so does an
// overflow of finite ones, which check then clears. The tests one by one
// cost a resting part's solve some 150 instructions a point.
func pointOK(p *Point, n int32) bool {
	if uint32(p.A) >= uint32(n) || uint32(p.B) >= uint32(n) || p.A == p.B {
		return false
	}
	if l := dot3(&p.Normal, &p.Normal); !(math.Abs(l-1) <= 1e-6) {
		return false
	}
	sum := p.Position[0] + p.Position[1] + p.Position[2] +
		p.SurfaceVelocity[0] + p.SurfaceVelocity[1] + p.SurfaceVelocity[2] +
		p.PatchCenter[0] + p.PatchCenter[1] + p.PatchCenter[2] +
		p.Separation + p.Friction + p.StaticFriction + p.Restitution + p.PatchRadius
	return sum-sum == 0 && p.PatchRadius >= 0
}
