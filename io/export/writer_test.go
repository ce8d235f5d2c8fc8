package export

import (
	"errors"
	"io"
	"testing"

	"github.com/phigrid/phigrid/grid"
)

// failWriter accepts n bytes and then fails every write.
type failWriter struct{ n int }

var errDisk = errors.New("disk full")

func (w *failWriter) Write(p []byte) (int, error) {
	if len(p) <= w.n {
		w.n -= len(p)
		return len(p), nil
	}
	k := w.n
	w.n = 0
	return k, errDisk
}

func TestWritersReportWriteErrors(t *testing.T) {
	g, f := testGrid(t, grid.Planar)
	big := make([]float64, 3*npyChunk)
	laplace := emitAll([]entry{{0, 0, 2}, {1, 0, -1}, {1, 1, 2}})
	writers := []struct {
		name  string
		write func(io.Writer) error
	}{
		{"WriteNPY", func(w io.Writer) error { return WriteNPY(w, big) }},
		{"WriteVTR", func(w io.Writer) error { return WriteVTR(w, g, f) }},
		{"WriteCSV", func(w io.Writer) error { return WriteCSV(w, []string{"a"}, [][]string{{"1"}, {"2"}}) }},
		{"WriteMatrixMarket", func(w io.Writer) error { return WriteMatrixMarket(w, 2, laplace, true, "c") }},
		{"WriteMatrixMarketVector", func(w io.Writer) error { return WriteMatrixMarketVector(w, big, "c") }},
	}
	for _, wr := range writers {
		for _, n := range []int{0, 1, 100, 5000} {
			// Find the full size first, and only test limits below it.
			var count countWriter
			if err := wr.write(&count); err != nil {
				t.Fatal(err)
			}
			if n >= count.n {
				continue
			}
			if err := wr.write(&failWriter{n: n}); !errors.Is(err, errDisk) {
				t.Errorf("%s failing after %d of %d bytes: error %v, want the write error", wr.name, n, count.n, err)
			}
		}
	}
}

type countWriter struct{ n int }

func (w *countWriter) Write(p []byte) (int, error) { w.n += len(p); return len(p), nil }
