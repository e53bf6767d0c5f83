//go:build !unix

package main

import "errors"

// mkfifo: named pipes are a unix file kind.
func mkfifo(path string) error { return errors.New("no named pipes on this system") }
