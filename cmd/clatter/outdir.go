package main

import (
	"errors"
	"io/fs"
	"os"
)

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
