package bench

import "testing"

func BenchmarkCartonDropRigid(b *testing.B)   { CartonDropRigid(b) }
func BenchmarkCartonDropCushion(b *testing.B) { CartonDropCushion(b) }
