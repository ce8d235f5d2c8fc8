package export

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// AtomicWriteFile writes a file so that path holds either its old content
// (or nothing) or the complete new content, never a partial one.
//
// It creates a temporary file in the directory of path, passes a buffered
// writer on it to write, flushes, syncs it to stable storage, closes it and
// renames it to path. If write returns an error or panics, or any step
// fails, the temporary file is removed, path is left untouched and the error
// is returned. The new file takes the permission bits of the file it
// replaces, or 0644 when path did not exist. The directory must exist.
func AtomicWriteFile(path string, write func(io.Writer) error) error {
	dir, base := filepath.Split(path)
	if base == "" {
		return invalidf("cannot write to %q: the path names a directory; give a file name", path)
	}
	if dir == "" {
		dir = "."
	}
	perm := os.FileMode(0o644)
	if st, serr := os.Stat(path); serr == nil {
		if !st.Mode().IsRegular() {
			return invalidf("cannot replace %q: it is not a regular file", path)
		}
		perm = st.Mode().Perm()
	}

	f, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return fmt.Errorf("export: creating a temporary file beside %s: %w", path, err)
	}
	tmp := f.Name()
	done := false
	defer func() {
		if !done {
			f.Close()
			os.Remove(tmp)
		}
	}()

	bw := bufio.NewWriterSize(f, 64<<10)
	if err := write(bw); err != nil {
		return fmt.Errorf("export: writing %s: %w", path, err)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("export: writing %s: %w", path, err)
	}
	if err := f.Chmod(perm); err != nil {
		return fmt.Errorf("export: setting the permissions of %s: %w", path, err)
	}
	if err := f.Sync(); err != nil {
		return fmt.Errorf("export: syncing %s: %w", path, err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("export: closing %s: %w", path, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		done = true
		return fmt.Errorf("export: renaming the temporary file to %s: %w", path, err)
	}
	done = true
	syncDir(dir)
	return nil
}

// syncDir makes a rename in dir durable where the system allows syncing a
// directory. Failure is ignored: the file itself is complete either way.
func syncDir(dir string) {
	d, err := os.Open(dir)
	if err != nil {
		return
	}
	d.Sync()
	d.Close()
}
