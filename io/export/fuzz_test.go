package export

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// addSeeds adds every file of testdata/dir to the corpus of f.
func addSeeds(f *testing.F, dir string) {
	ents, err := os.ReadDir(filepath.Join("testdata", dir))
	if err != nil {
		f.Fatal(err)
	}
	for _, e := range ents {
		b, err := os.ReadFile(filepath.Join("testdata", dir, e.Name()))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
}

// FuzzReadNPY checks that ReadNPY never panics, and that whatever it
// accepts survives a write and a second read unchanged.
func FuzzReadNPY(f *testing.F) {
	addSeeds(f, "npy")
	f.Fuzz(func(t *testing.T, in []byte) {
		data, shape, err := ReadNPY(bytes.NewReader(in))
		if err != nil {
			return
		}
		if len(shape) == 0 {
			shape = []int{1} // WriteNPY has no 0-d form
		}
		var buf bytes.Buffer
		if err := WriteNPY(&buf, data, shape...); err != nil {
			t.Fatalf("writing back what was read: %v", err)
		}
		data2, shape2, err := ReadNPY(&buf)
		if err != nil {
			t.Fatalf("reading back: %v", err)
		}
		if diff := cmp.Diff(shape, shape2); diff != "" {
			t.Errorf("shape changed (-first +second):\n%s", diff)
		}
		if diff := cmp.Diff(data, data2, sameBits); diff != "" {
			t.Errorf("data changed (-first +second):\n%s", diff)
		}
	})
}

// FuzzReadMatrixMarket checks that the Matrix Market readers never panic,
// and that a square matrix they accept survives a write and a second read.
func FuzzReadMatrixMarket(f *testing.F) {
	addSeeds(f, "mtx")
	f.Fuzz(func(t *testing.T, in []byte) {
		if b, err := ReadMatrixMarketVector(bytes.NewReader(in)); err == nil {
			var buf bytes.Buffer
			if err := WriteMatrixMarketVector(&buf, b, ""); err != nil {
				t.Fatal(err)
			}
			b2, err := ReadMatrixMarketVector(&buf)
			if err != nil {
				t.Fatalf("reading back a vector: %v", err)
			}
			if diff := cmp.Diff(b, b2, sameBits); diff != "" {
				t.Errorf("vector changed (-first +second):\n%s", diff)
			}
		}
		m, err := ReadMatrixMarket(bytes.NewReader(in))
		if err != nil {
			return
		}
		if len(m.I) != len(m.V) || len(m.J) != len(m.V) {
			t.Fatalf("triplet lengths %d, %d, %d differ", len(m.I), len(m.J), len(m.V))
		}
		for k := range m.V {
			if m.I[k] < 0 || m.I[k] >= m.Rows || m.J[k] < 0 || m.J[k] >= m.Cols {
				t.Fatalf("entry %d at (%d, %d) outside %d×%d", k, m.I[k], m.J[k], m.Rows, m.Cols)
			}
		}
		if m.Rows != m.Cols {
			return
		}
		var buf bytes.Buffer
		err = WriteMatrixMarket(&buf, m.Rows, func(emit func(i, j int, v float64)) {
			for k := range m.V {
				emit(m.I[k], m.J[k], m.V[k])
			}
		}, false, "")
		if err != nil {
			t.Fatal(err)
		}
		m2, err := ReadMatrixMarket(&buf)
		if err != nil {
			t.Fatalf("reading back: %v", err)
		}
		if diff := cmp.Diff(m.V, m2.V, sameBits); diff != "" {
			t.Errorf("values changed (-first +second):\n%s", diff)
		}
		if diff := cmp.Diff([][]int{m.I, m.J}, [][]int{m2.I, m2.J}); diff != "" {
			t.Errorf("indices changed (-first +second):\n%s", diff)
		}
	})
}
