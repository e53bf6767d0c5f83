package bench

import "testing"

func BenchmarkCollideGJKHull40(b *testing.B)       { CollideGJKHull40(b) }
func BenchmarkCollideEPAHull40(b *testing.B)       { CollideEPAHull40(b) }
func BenchmarkCollideBoxBoxResting(b *testing.B)   { CollideBoxBoxResting(b) }
func BenchmarkCollideBoxBoxRandom(b *testing.B)    { CollideBoxBoxRandom(b) }
func BenchmarkCollideHullHullResting(b *testing.B) { CollideHullHullResting(b) }
func BenchmarkCollideHullHullRandom(b *testing.B)  { CollideHullHullRandom(b) }
func BenchmarkCollideBoxHullRandom(b *testing.B)   { CollideBoxHullRandom(b) }
func BenchmarkCollidePairApart(b *testing.B)       { CollidePairApart(b) }
func BenchmarkCollideBoxPlane(b *testing.B)        { CollideBoxPlane(b) }
func BenchmarkCollideCylinderBox(b *testing.B)     { CollideCylinderBox(b) }
func BenchmarkCollideBoxMesh(b *testing.B)         { CollideBoxMesh(b) }
func BenchmarkCollideCylinderMesh(b *testing.B)    { CollideCylinderMesh(b) }
