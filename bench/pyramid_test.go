package bench

import "testing"

func BenchmarkPyramidAwake(b *testing.B) { PyramidAwake(b) }
