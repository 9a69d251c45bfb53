//go:build unix

package hostile

import "syscall"

// mkfifo makes a named pipe at p (POSIX mkfifo); true when made.
func mkfifo(p string) (bool, error) {
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		return false, err
	}
	return true, nil
}
