package splitmix

// Golden is 2^64 divided by the golden ratio, the increment of SplitMix64.
const Golden = 0x9e3779b97f4a7c15

// Mix is the SplitMix64 output function (G. L. Steele, D. Lea and
// C. H. Flood, "Fast splittable pseudorandom number generators",
// OOPSLA 2014): a bijection of 64-bit words whose outputs for nearby
// inputs are statistically independent.
func Mix(z uint64) uint64 {
	z = (z ^ z>>30) * 0xbf58476d1ce4e5b9
	z = (z ^ z>>27) * 0x94d049bb133111eb
	return z ^ z>>31
}
