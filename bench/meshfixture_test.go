package bench

import "testing"

func BenchmarkBoxOnMeshFixture(b *testing.B) { BoxOnMeshFixture(b) }
