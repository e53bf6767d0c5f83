package bench

import "testing"

func BenchmarkBroadPhase10k(b *testing.B)              { BroadPhase10k(b) }
func BenchmarkBroadPhaseAllPairs10k(b *testing.B)      { BroadPhaseAllPairs10k(b) }
func BenchmarkBroadPhaseCloud10k(b *testing.B)         { BroadPhaseCloud10k(b) }
func BenchmarkBroadPhaseCloudAllPairs10k(b *testing.B) { BroadPhaseCloudAllPairs10k(b) }
