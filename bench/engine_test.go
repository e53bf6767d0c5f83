package bench

import "testing"

func BenchmarkPile1000(b *testing.B)  { Pile1000(b) }
func BenchmarkPile200(b *testing.B)   { Pile200(b) }
func BenchmarkDropTrial(b *testing.B) { DropTrial(b) }

func BenchmarkDropTrialMesh(b *testing.B) { DropTrialMesh(b) }
