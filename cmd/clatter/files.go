package main

import (
	"bytes"
	"errors"
	"io/fs"
	"os"

	"clatter/engine/scene"
	"clatter/shapes/mesh"
)

// Files and folders named on the command line.

// writableDir makes the output folder if it is missing and checks that a
// file can be written there, so that a folder that cannot be used is bad
// input (exit 2) whether or not it exists, before any work is done.
func writableDir(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return plainPathError(err)
	}
	f, err := os.CreateTemp(dir, ".clatter-probe-*")
	if err != nil {
		return plainPathError(err)
	}
	name := f.Name()
	f.Close()
	return os.Remove(name)
}

func plainPathError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// loadPart reads an STL part named on the command line: a regular file
// within scene.MaxInputBytes (a fifo or a device is refused, not read).
func loadPart(path string, unit mesh.Unit) (*mesh.Part, error) {
	data, err := scene.ReadInput(path, scene.MaxInputBytes)
	if err != nil {
		return nil, err
	}
	m, err := mesh.ReadSTL(bytes.NewReader(data), path, unit)
	if err != nil {
		return nil, err
	}
	return mesh.NewPart(m)
}
