package bench

import "testing"

func BenchmarkBVHBuild100k(b *testing.B)      { BVHBuild100k(b) }
func BenchmarkBVHQuery100k(b *testing.B)      { BVHQuery100k(b) }
func BenchmarkBVHQueryBrute100k(b *testing.B) { BVHQueryBrute100k(b) }
func BenchmarkBVHRay100k(b *testing.B)        { BVHRay100k(b) }
