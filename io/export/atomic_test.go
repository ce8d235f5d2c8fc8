package export

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// dirNames returns the names in dir.
func dirNames(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	return names
}

func TestAtomicWriteFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := AtomicWriteFile(path, func(w io.Writer) error {
		_, err := io.WriteString(w, "hello\n")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != "hello\n" {
		t.Errorf("content %q, want %q", got, "hello\n")
	}
	if names := dirNames(t, dir); len(names) != 1 {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
	if runtime.GOOS != "windows" {
		st, err := os.Stat(path)
		if err != nil {
			t.Fatal(err)
		}
		if st.Mode().Perm() != 0o644 {
			t.Errorf("new file mode %v, want 0644", st.Mode().Perm())
		}
	}
}

func TestAtomicWriteFileFailure(t *testing.T) {
	boom := errors.New("boom")
	tests := []struct {
		reason string
		write  func(io.Writer) error
	}{
		{"error before writing", func(io.Writer) error { return boom }},
		{"error after a partial write", func(w io.Writer) error {
			io.WriteString(w, strings.Repeat("partial ", 20000)) // more than the buffer
			return boom
		}},
		{"panic", func(w io.Writer) error {
			io.WriteString(w, "partial")
			panic(boom)
		}},
	}
	for _, tt := range tests {
		for _, existing := range []bool{false, true} {
			name := tt.reason
			if existing {
				name += ", replacing a file"
			}
			t.Run(name, func(t *testing.T) {
				dir := t.TempDir()
				path := filepath.Join(dir, "out.npy")
				if existing {
					if err := os.WriteFile(path, []byte("old"), 0o600); err != nil {
						t.Fatal(err)
					}
				}
				var err error
				func() {
					defer func() {
						if r := recover(); r != nil {
							err = r.(error)
						}
					}()
					err = AtomicWriteFile(path, tt.write)
				}()
				if !errors.Is(err, boom) {
					t.Errorf("error %v, want one wrapping boom", err)
				}
				names := dirNames(t, dir)
				if existing {
					got, rerr := os.ReadFile(path)
					if rerr != nil || string(got) != "old" {
						t.Errorf("existing file now %q (%v), want it untouched", got, rerr)
					}
					if len(names) != 1 {
						t.Errorf("directory holds %v, want only out.npy", names)
					}
				} else if len(names) != 0 {
					t.Errorf("directory holds %v, want nothing", names)
				}
			})
		}
	}
}

func TestAtomicWriteFileKeepsMode(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("Unix permission bits")
	}
	path := filepath.Join(t.TempDir(), "out.csv")
	if err := os.WriteFile(path, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(path, 0o640); err != nil {
		t.Fatal(err)
	}
	if err := AtomicWriteFile(path, func(w io.Writer) error { _, err := io.WriteString(w, "new"); return err }); err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if st.Mode().Perm() != 0o640 {
		t.Errorf("mode %v, want the replaced file's 0640", st.Mode().Perm())
	}
}

func TestAtomicWriteFileBadPath(t *testing.T) {
	dir := t.TempDir()
	ok := func(w io.Writer) error { return nil }
	tests := []struct {
		reason string
		path   string
	}{
		{"missing directory", filepath.Join(dir, "no", "such", "out.npy")},
		{"path is a directory", dir},
		{"trailing separator", dir + string(filepath.Separator)},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			if err := AtomicWriteFile(tt.path, ok); err == nil {
				t.Errorf("no error writing %s", tt.path)
			}
			if names := dirNames(t, dir); len(names) != 0 {
				t.Errorf("directory holds %v, want nothing", names)
			}
		})
	}
}
