package archive

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/klauspost/compress/zstd"

	"github.com/phigrid/phigrid/bc"
)

// FuzzRead feeds Read arbitrary bytes, starting from the archives in
// testdata/. Read must never panic; whatever it accepts must rebuild a
// solution without panicking and write back to an equal archive.
func FuzzRead(f *testing.F) {
	paths, _ := filepath.Glob(filepath.Join("testdata", "*.pga"))
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte{})
	f.Add(magic[:])
	f.Fuzz(func(t *testing.T, data []byte) {
		a, err := Read(bytes.NewReader(data))
		if err != nil {
			if a != nil {
				t.Fatal("Read returned an archive and an error")
			}
			return
		}
		if sol, err := a.Solution(); err == nil {
			sol.Charges()
			sol.Energy()
			for k := range sol.Map.Conductors {
				sol.PeakSurfaceField(k)
			}
			sol.PeakRegionFields()
		}
		var buf bytes.Buffer
		if err := Write(&buf, a); err != nil {
			t.Fatalf("an archive Read accepted does not write back: %v", err)
		}
		b, err := Read(&buf)
		if err != nil {
			t.Fatalf("an archive written back does not read: %v", err)
		}
		b.Version = a.Version
		if d := cmp.Diff(a, b, exact, cmpopts.IgnoreFields(bc.Side{}, "Func")); d != "" {
			t.Fatalf("write-back changed the archive:\n%s", d)
		}
	})
}

// FuzzPayload mutates the decompressed payload of the seed archive and
// wraps it in a valid frame, so the fuzzer reaches the section parser and
// the consistency checks rather than stopping at the zstd checksum.
func FuzzPayload(f *testing.F) {
	b, err := os.ReadFile(filepath.Join("testdata", "small.pga"))
	if err != nil {
		f.Fatal(err)
	}
	dec, err := zstd.NewReader(nil)
	if err != nil {
		f.Fatal(err)
	}
	payload, err := dec.DecodeAll(b[headerSize:], nil)
	dec.Close()
	if err != nil {
		f.Fatal(err)
	}
	f.Add(payload)
	enc, err := zstd.NewWriter(nil, zstd.WithEncoderConcurrency(1))
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, p []byte) {
		file := append(append([]byte(nil), b[:headerSize]...), enc.EncodeAll(p, nil)...)
		a, err := Read(bytes.NewReader(file))
		if err != nil {
			return
		}
		if sol, err := a.Solution(); err == nil {
			sol.Charges()
			sol.Energy()
			for k := range sol.Map.Conductors {
				sol.PeakSurfaceField(k)
			}
			sol.PeakRegionFields()
			sol.NodeFieldTo(nil, nil)
		}
		var buf bytes.Buffer
		if err := Write(&buf, a); err != nil {
			t.Fatalf("an archive Read accepted does not write back: %v", err)
		}
	})
}
