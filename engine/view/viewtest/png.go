package viewtest

import (
	"image"
	_ "image/png" // the pictures and screenshots are PNG
	"os"
	"testing"
)

// ReadPNG decodes the PNG picture at path, failing the test if it cannot.
func ReadPNG(t *testing.T, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, _, err := image.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return img
}
