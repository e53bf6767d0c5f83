package engine

import "math"

// stepAdvice ends a divergence message: the remedy that a user of the world
// (and of a scene file, through its [world] step) always has.
const stepAdvice = "a time step too large for the sizes, speeds or mass ratios in the scene does this: try a smaller step"

// notFinite names the first part of body i's state that is not a finite
// number, or returns "" when all of it is.
func (w *World) notFinite(i int) string {
	switch {
	case !finiteVec(w.b.pos[i]):
		return "position"
	case !finiteVec(w.b.vel[i]):
		return "velocity"
	case !finiteVec(w.b.spin[i]):
		return "spin"
	case math.IsNaN(w.b.rot[i].W) || math.IsInf(w.b.rot[i].W, 0):
		return "orientation"
	}
	return ""
}
