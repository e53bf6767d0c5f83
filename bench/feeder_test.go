package bench

import "testing"

func BenchmarkBowlFeeder50(b *testing.B) { BowlFeeder50(b) }
