package sweep

import (
	"math/rand/v2"

	"clatter/internal/splitmix"
)

// seedOut returns the SplitMix64 output for state x.
func seedOut(x uint64) uint64 { return splitmix.Mix(x + splitmix.Golden) }

// TrialSeed is the seed of trial t of case c in a study with the given
// seed. It depends on these three numbers only, so a trial draws the same
// whatever worker runs it, in whatever order, in whatever shard.
func TrialSeed(seed uint64, c, t int64) uint64 {
	h := seedOut(seed)
	h = seedOut(h ^ uint64(c))
	return seedOut(h ^ uint64(t))
}

// trialRand is the generator of a trial: PCG (O'Neill 2014, as in
// math/rand/v2) with both words of its state derived from the trial seed.
func trialRand(seed uint64) *rand.Rand {
	return rand.New(rand.NewPCG(seed, seedOut(seed^0x5851f42d4c957f2d)))
}
