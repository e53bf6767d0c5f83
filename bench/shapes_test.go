package bench

import "testing"

func BenchmarkHull10k(b *testing.B)      { Hull10k(b) }
func BenchmarkMeshMass100k(b *testing.B) { MeshMass100k(b) }
