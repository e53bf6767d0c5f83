package scratch

import "testing"

// TestReuse checks that a reused buffer is empty, keeps its memory, and
// reads as zero values over its whole capacity, as make would give (the
// Go specification: "the elements are initialized to their zero value").
func TestReuse(t *testing.T) {
	b := make([]int, 3, 8)
	for i := range b[:cap(b)] {
		b[:cap(b)][i] = i + 1
	}
	r := Reuse(b)
	if len(r) != 0 || cap(r) != 8 || &r[:1][0] != &b[0] {
		t.Fatalf("Reuse gave len %d cap %d (want 0 and 8, the same memory)", len(r), cap(r))
	}
	for i, v := range r[:cap(r)] {
		if v != 0 {
			t.Errorf("element %d is %d after Reuse, want 0", i, v)
		}
	}
	if got := Reuse[int](nil); got != nil {
		t.Errorf("Reuse(nil) = %v, want nil", got)
	}
}
