package bench

import "testing"

func BenchmarkSleep1000(b *testing.B) { Sleep1000(b) }
