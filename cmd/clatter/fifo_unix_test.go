//go:build unix

package main

import "syscall"

// mkfifo makes a named pipe, for the tests of hostile input.
func mkfifo(path string) error { return syscall.Mkfifo(path, 0o644) }
