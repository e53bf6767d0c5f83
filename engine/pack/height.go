package pack

import "fmt"

// heightByMass is the drop-height table of ISTA Procedure 1A ("Packaged
// Products weighing 150 lb (68 kg) or Less", International Safe Transit
// Association): for a packaged product of mass below the bound (kg), the
// free-fall drop height (m). Quoted as the issue of the procedure gives
// it: 0-10 kg 760 mm, 10-19 kg 610 mm, 19-28 kg 460 mm, 28-45 kg 310 mm,
// 45-68 kg 200 mm; the procedure does not cover heavier packages.
var heightByMass = []struct{ below, height float64 }{
	{10, 0.760},
	{19, 0.610},
	{28, 0.460},
	{45, 0.310},
	{68, 0.200},
}

// MaxMassByHeight is the heaviest mass (kg, exclusive) the table covers.
const MaxMassByHeight = 68.0

// HeightByMass returns the drop height (m) of the ISTA 1A table for a
// packaged product of mass kg; a mass at a bound takes the lower height
// of the next row (the table's ranges are "up to but not including").
func HeightByMass(mass float64) (float64, error) {
	if !(mass > 0) {
		return 0, fmt.Errorf("the mass must be positive to choose a drop height, got %g kg", mass)
	}
	for _, row := range heightByMass {
		if mass < row.below {
			return row.height, nil
		}
	}
	return 0, fmt.Errorf("the body's mass %.4g kg is beyond the drop-height table (ISTA 1A covers packages below %g kg); give the height, e.g. height = \"200 mm\", or test it as the procedures for heavy packages say", mass, MaxMassByHeight)
}
