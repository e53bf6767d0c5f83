package sweep

import "math/rand/v2"

// golden is 2^64 divided by the golden ratio, the increment of SplitMix64.
const golden = 0x9e3779b97f4a7c15

// mix64 is the SplitMix64 output function (G. L. Steele, D. Lea and
// C. H. Flood, "Fast splittable pseudorandom number generators",
// OOPSLA 2014): a bijection of 64-bit words whose outputs for nearby inputs
// are statistically independent.
func mix64(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// splitmix returns the SplitMix64 output for state x: mix64(x + golden).
func splitmix(x uint64) uint64 { return mix64(x + golden) }

// TrialSeed is the seed of trial t of case c in a study with the given
// seed. It depends on these three numbers only, so a trial draws the same
// whatever worker runs it, in whatever order, in whatever shard.
func TrialSeed(seed uint64, c, t int64) uint64 {
	h := splitmix(seed)
	h = splitmix(h ^ uint64(c))
	return splitmix(h ^ uint64(t))
}

// trialRand is the generator of a trial: PCG (O'Neill 2014, as in
// math/rand/v2) with both words of its state derived from the trial seed.
func trialRand(seed uint64) *rand.Rand {
	return rand.New(rand.NewPCG(seed, splitmix(seed^0x5851f42d4c957f2d)))
}
