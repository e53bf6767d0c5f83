package bench

import "testing"

func BenchmarkSweepDrop1(b *testing.B) { SweepDrop1(b) }
func BenchmarkSweepDrop2(b *testing.B) { SweepDrop2(b) }
