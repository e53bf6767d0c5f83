package bench

import "testing"

func TestPourGridKeepsDensity(t *testing.T) {
	// Every pour has 1000/121 parts per column (11 x 11 columns for 1000
	// parts), so that parts per floor area and the pile's height are the
	// same at every size and only the count changes.
	for _, n := range pourSizes {
		kx, ky := pourGrid(n)
		if kx*ky*1000 != n*121 {
			t.Errorf("pourGrid(%d) = %d x %d columns, want %d columns", n, kx, ky, n*121/1000)
		}
	}
}
