package verify

import (
	"context"

	"clatter/engine/report"
	"clatter/engine/scene"
)

// runScene reads a case's scene text (name is the file name its errors
// give) and runs it as `clatter run` would, returning the summary.
func runScene(text, name string) (*report.Summary, error) {
	s, err := scene.Parse([]byte(text), name, scene.Options{})
	if err != nil {
		return nil, err
	}
	return report.Run(context.Background(), s, report.Options{})
}
