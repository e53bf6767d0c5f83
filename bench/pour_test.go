package bench

import "testing"

func BenchmarkPour1000(b *testing.B) { Pour1000(b) }
func BenchmarkPour2000(b *testing.B) { pour(b, 2000) }
func BenchmarkPour4000(b *testing.B) { pour(b, 4000) }
func BenchmarkPour8000(b *testing.B) { pour(b, 8000) }
