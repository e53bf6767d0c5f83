package engine

import (
	"math"
	"math/cmplx"
	"sort"

	"clatter/shapes"
)

// Figures of a vibratory feeder's drive. A vibrating track conveys parts
// by friction during the part of each stroke in which it presses on them
// and lets them slide or hop during the rest. How hard it presses is told
// by the throw number: the peak acceleration of the track along its
// normal over the part of gravity along it, Gamma = a_n / (g cos alpha)
// for a track at angle alpha. Below 1 the parts never leave the track
// and only slide; above 1 they hop on every stroke (G. Boothroyd,
// "Assembly Automation and Product Design", 2nd ed., 2005, ch. 3, and
// A. H. Redford and G. Boothroyd, "Vibratory feeding", Proc. IMechE
// 182(1), 1967; common feeder-design practice).

// ThrowNumber returns the throw number of the vibration for a track whose
// outward normal at the world point at is normal (any length), under
// gravity: the peak over time of the track's acceleration along the
// normal, divided by the component of gravity pressing parts onto the
// track. It returns NaN when gravity does not press onto the track (a
// track facing sideways or down, or no gravity). The rotary terms count
// through the motion they give the point at, to first order in their
// small angles.
func (v *Vibration) ThrowNumber(at, normal, gravity shapes.Vec3) float64 {
	n := normal.Normalize()
	press := -gravity.Dot(n)
	if !(press > 0) {
		return math.NaN()
	}
	// One phasor of normal acceleration per frequency: terms of equal
	// frequency add as complex amplitudes, exactly.
	byFreq := map[float64]complex128{}
	for _, o := range v.Terms {
		c := o.Axis.Normalize().Dot(n)
		if o.Rotary {
			c = o.Axis.Normalize().Cross(at.Sub(v.Center)).Dot(n)
		}
		w := 2 * math.Pi * o.Frequency
		byFreq[o.Frequency] += complex(w*w*o.Amplitude*c, 0) * cmplx.Exp(complex(0, o.Phase))
	}
	return peakOfSines(byFreq) / press
}

// peakOfSines returns the largest |sum_k |a_k| sin(2 pi f_k t + arg a_k)|
// over time: exact for one frequency; for several, the largest of the sum
// sampled 64 times per period of the highest frequency over ten periods of
// the lowest (the sum of incommensurate sines has no period; this finds
// its peak to within about 0.1 percent of the amplitude).
func peakOfSines(byFreq map[float64]complex128) float64 {
	freqs := make([]float64, 0, len(byFreq))
	for f, a := range byFreq {
		if f > 0 && a != 0 {
			freqs = append(freqs, f)
		}
	}
	sort.Float64s(freqs)
	switch len(freqs) {
	case 0:
		return 0
	case 1:
		return cmplx.Abs(byFreq[freqs[0]])
	}
	lo, hi := freqs[0], freqs[len(freqs)-1]
	n := int(math.Min(1e6, math.Ceil(640*hi/lo)))
	span := 10 / lo
	peak := 0.0
	for i := 0; i <= n; i++ {
		t := span * float64(i) / float64(n)
		s := 0.0
		for _, f := range freqs {
			a := byFreq[f]
			s += cmplx.Abs(a) * math.Sin(2*math.Pi*f*t+cmplx.Phase(a))
		}
		peak = math.Max(peak, math.Abs(s))
	}
	return peak
}

// AlongAcceleration bounds the acceleration of the track's point at
// (world) along the unit direction dir: the sum of each term's peak, as
// terms out of phase never exceed it. It allocates nothing.
func (v *Vibration) AlongAcceleration(at, dir shapes.Vec3) float64 {
	sum := 0.0
	for _, o := range v.Terms {
		c := o.Axis.Normalize().Dot(dir)
		if o.Rotary {
			c = o.Axis.Normalize().Cross(at.Sub(v.Center)).Dot(dir)
		}
		w := 2 * math.Pi * o.Frequency
		sum += math.Abs(w * w * o.Amplitude * c)
	}
	return sum
}

// ConveyingDirection returns the direction in which the vibration carries
// parts lying at the world point at on a track with the given normal: the
// direction of the track's stroke there (the linear terms, and the rotary
// terms through the motion they give that point; a term of phase 180
// degrees counts against the others), with its part along the
// normal removed, of unit length; zero when the stroke is all along the
// normal.
func (v *Vibration) ConveyingDirection(at, normal shapes.Vec3) shapes.Vec3 {
	n := normal.Normalize()
	var d shapes.Vec3
	for _, o := range v.Terms {
		a := o.Axis.Normalize().Mul(o.Amplitude * math.Cos(o.Phase)) // a term in anti-phase pushes the other way
		if o.Rotary {
			a = a.Cross(at.Sub(v.Center))
		}
		d = d.Add(a)
	}
	d = d.Sub(n.Mul(d.Dot(n)))
	if l := d.Len(); l > 1e-12*math.Max(1, at.Sub(v.Center).Len()) {
		return d.Mul(1 / l)
	}
	return shapes.Vec3{}
}

// ConveyingSpeedModel is the mean conveying speed, over cycles [skip,
// skip+cycles) from rest, of a particle on a linear feeder's track that
// rises at alpha and vibrates as x = amp sin(2 pi freq t) along a line at
// psi above the track, with friction mu under gravity g: the sliding and
// hopping models of A. H. Redford and G. Boothroyd ("Vibratory feeding",
// Proc. IMechE 182, 1967-68), stepped at 1/20000 of a cycle: sticking and
// sliding by Coulomb's law with the normal force from the track's
// acceleration, free flight when that force would pull, and a landing
// that stops the normal motion with a friction impulse of at most mu
// times the normal one (no bounce). It is the reference the engine's
// feeders are checked against.
func ConveyingSpeedModel(alpha, psi, mu, freq, amp, g float64, skip, cycles int) float64 {
	w := 2 * math.Pi * freq
	h := 1 / freq / 20000
	gt, gn := -g*math.Sin(alpha), -g*math.Cos(alpha) // gravity in track axes
	var u, gap, vn, travel float64                   // part relative to the track: tangential speed, normal gap and speed
	n0, n1 := skip*20000, (skip+cycles)*20000
	for i := 0; i < n1; i++ {
		s := math.Sin(w * (float64(i) + 0.5) * h)
		at, an := -amp*w*w*math.Cos(psi)*s, -amp*w*w*math.Sin(psi)*s // track acceleration
		if gap <= 0 && vn <= 0 {
			normal := an - gn // per unit mass, what keeps the part on the track
			if normal >= 0 {
				gap, vn = 0, 0
				du := (gt - at) * h
				lim := mu * normal * h
				switch v := u + du; {
				case math.Abs(v) <= lim:
					u = 0
				default:
					u = v - math.Copysign(lim, v)
				}
				if i >= n0 {
					travel += u * h
				}
				continue
			}
		}
		// In flight.
		u += (gt - at) * h
		vn += (gn - an) * h
		gap += vn * h
		if gap <= 0 && vn < 0 { // lands without bouncing
			p := -vn
			if math.Abs(u) <= mu*p {
				u = 0
			} else {
				u -= math.Copysign(mu*p, u)
			}
			gap, vn = 0, 0
		}
		if i >= n0 {
			travel += u * h
		}
	}
	return travel / (float64(cycles) / freq)
}
