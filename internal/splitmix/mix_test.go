package splitmix

import "testing"

// TestMix checks the first outputs of SplitMix64 from state 0 (the
// state advanced by Golden before each output) against the test vector of
// the reference implementation (S. Vigna, splitmix64.c, 2015; values from
// memory): a wrong constant or shift changes every one of them.
func TestMix(t *testing.T) {
	want := []uint64{0xe220a8397b1dcdaf, 0x6e789e6aa1b965f4, 0x06c45d188009454f}
	state := uint64(0)
	for i, w := range want {
		state += Golden
		if got := Mix(state); got != w {
			t.Errorf("output %d: %#x, want %#x", i, got, w)
		}
	}
}
