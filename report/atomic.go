package report

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// WriteFileAtomic creates or replaces the file at path with what write
// produces, so that a reader (or a later run) sees either the old file or the
// complete new one, never a partial one: write goes to a temporary file in the
// same directory (so the rename stays on one file system), which is flushed,
// fsynced and closed, then renamed over path; the directory is fsynced so the
// rename itself survives a crash. On any error, or if write fails, the
// temporary file is removed and path is untouched. The new file has mode 0644
// (minus umask). An interrupted process may leave a ".*.tmp-*" file behind,
// whose name does not look like a finished report.
func WriteFileAtomic(path string, write func(io.Writer) error) error {
	return writeFileRenamed(path, write, true)
}

// writeFileRenamed is WriteFileAtomic with the fsyncs optional: thumbnails
// are renamed into place complete but not synced, since an fsync per image
// would cost more than making it (measured: tens of milliseconds each on a
// busy disk) and a thumbnail lost in a crash loses no evidence.
func writeFileRenamed(path string, write func(io.Writer) error, sync bool) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return fmt.Errorf("report: create temporary file for %s: %w", path, err)
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
		}
	}()
	bw := bufio.NewWriterSize(f, 256<<10)
	if err = write(bw); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	if err = bw.Flush(); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	if err = f.Chmod(0o644); err != nil {
		return fmt.Errorf("report: chmod %s: %w", tmp, err)
	}
	if sync {
		if err = f.Sync(); err != nil {
			return fmt.Errorf("report: sync %s: %w", tmp, err)
		}
	}
	if err = f.Close(); err != nil {
		return fmt.Errorf("report: close %s: %w", tmp, err)
	}
	if err = os.Rename(tmp, path); err != nil {
		return fmt.Errorf("report: rename %s to %s: %w", tmp, path, err)
	}
	if !sync {
		return nil
	}
	if d, derr := os.Open(dir); derr == nil {
		// Best effort: some file systems do not support syncing a directory.
		_ = d.Sync()
		d.Close()
	}
	return nil
}
