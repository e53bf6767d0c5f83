// Package splitmix scrambles 64-bit words: the output function of SplitMix64,
// used wherever the engine needs a well-spread hash of a few integers
// (warm-start keys, active-set hashes, trial seeds).
package splitmix
