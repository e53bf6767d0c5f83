package bench

import "testing"

func BenchmarkChain100(b *testing.B) { Chain100(b) }
