package bench

import "testing"

func BenchmarkRestStep(b *testing.B) { RestStep(b) }
