//go:build !unix

package sweep

import "os"

// tryLock on systems without flock: the lock file's presence is the lock
// (made by LockFolder with O_CREATE, so only a file with a holder's name
// in it counts as held). A file left by a crash must be removed by hand;
// the message names the process that wrote it.
func tryLock(f *os.File) (held bool, err error) {
	return readHolder(f).PID != 0, nil
}

func unlock(f *os.File) {}
