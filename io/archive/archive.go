package archive

import (
	"bufio"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/klauspost/compress/zstd"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/export"
	"github.com/phigrid/phigrid/solve"
)

// Major and Minor are the format version Write produces. Read accepts
// every minor version of Major.
const (
	Major = 1
	Minor = 0
)

// Limits that Read and Write enforce.
const (
	// MaxNodes caps nx·ny.
	MaxNodes = 1 << 28
	// MaxConductors caps the number of conductors.
	MaxConductors = 1 << 16
	// MaxText caps a bytes or json section (model text, problem, report).
	MaxText = 256 << 20
	// MaxWindow caps the zstd window a reader accepts.
	MaxWindow = 8 << 20
)

// magic opens every archive.
var magic = [8]byte{0x89, 'P', 'G', 'A', '\r', '\n', 0x1a, '\n'}

// headerSize is the size of the uncompressed file header.
const headerSize = 12

// Version is an archive format version.
type Version struct {
	Major, Minor int
}

// String returns "major.minor".
func (v Version) String() string { return fmt.Sprintf("%d.%d", v.Major, v.Minor) }

// Unit is the model's length unit: its name and its size in metres.
type Unit struct {
	Name  string
	Scale float64
}

// Archive is a whole solved problem as stored in an archive file.
type Archive struct {
	// Version is the format version Read found; Write ignores it and
	// always writes Major.Minor.
	Version Version
	// ModelName is the model file's name and ModelSource its text; both
	// optional.
	ModelName   string
	ModelSource []byte
	// Problem is the problem description, for redrawing shapes
	// (optional). A side whose potential was a function comes back with a
	// Func that interpolates the stored node values; see the package
	// documentation.
	Problem *bc.Problem
	// Unit is the model's length unit, for axes in pictures.
	Unit Unit
	// Grid is the grid; it must be Map.Grid, and Write takes Map.Grid
	// when Grid is nil.
	Grid *grid.Grid
	// Map is the rasterised problem the potential solves.
	Map *bc.Map
	// Phi holds the potential of every node and V of every conductor, in
	// volts.
	Phi, V []float64
	// Report is the JSON report (optional).
	Report []byte
}

// FromSolution returns an archive holding the grid, map and potentials of
// sol; set the model, problem, unit and report fields before writing. The
// archive shares sol's slices.
func FromSolution(sol *field.Solution) *Archive {
	return &Archive{Grid: sol.Grid, Map: sol.Map, Phi: sol.Phi, V: sol.V}
}

// Solution rebuilds a field.Solution from the archive, assembling the
// system again from the map, so that fields, charges, energy and surface
// fields can be evaluated; they equal those of the original solution
// exactly. The solution has no solver statistics and no capacitance
// matrix, and shares the archive's slices.
func (a *Archive) Solution() (*field.Solution, error) {
	if err := a.check(); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrInvalid, err)
	}
	sys, err := solve.Assemble(a.Map)
	if err != nil {
		return nil, fmt.Errorf("archive: assembling the archived problem: %w", err)
	}
	return &field.Solution{Grid: a.Map.Grid, Map: a.Map, Sys: sys, Phi: a.Phi, V: a.V}, nil
}

type metaJSON struct {
	Metric     string   `json:"metric"`
	Nx         int      `json:"nx"`
	Ny         int      `json:"ny"`
	Conductors int      `json:"conductors"`
	Snapped    int      `json:"snapped"`
	ModelName  string   `json:"model_name"`
	Unit       unitJSON `json:"unit"`
}

type unitJSON struct {
	Name  string  `json:"name"`
	Scale float64 `json:"scale"`
}

// Write writes a as an archive. It checks a first and returns an error
// wrapping ErrInvalid, having written nothing, when a is incomplete or
// inconsistent.
func Write(w io.Writer, a *Archive) error {
	if a == nil || a.Map == nil {
		return invalidf("the archive has no map; build it with FromSolution")
	}
	if a.Grid == nil {
		b := *a
		b.Grid = a.Map.Grid
		a = &b
	}
	if err := a.check(); err != nil {
		return fmt.Errorf("%w: %v", ErrInvalid, err)
	}
	m, g := a.Map, a.Grid
	meta, err := marshal(metaJSON{
		Metric: metricNames[g.Metric()], Nx: g.Nx(), Ny: g.Ny(), Conductors: len(m.Conductors),
		Snapped: m.Snapped, ModelName: a.ModelName, Unit: unitJSON{a.Unit.Name, a.Unit.Scale},
	})
	if err != nil {
		return err
	}
	var problem []byte
	if a.Problem != nil {
		if problem, err = encodeProblem(a.Problem); err != nil {
			return err
		}
	}
	conds, err := marshal(encodeConductors(m.Conductors))
	if err != nil {
		return err
	}
	sj, err := encodeSides(m.Sides)
	if err != nil {
		return err
	}
	sides, err := marshal(sj)
	if err != nil {
		return err
	}
	far, err := marshal(farJSON{m.Far.X, m.Far.Y, m.Far.Decay})
	if err != nil {
		return err
	}
	var regions []byte
	if m.Regions != nil {
		rs, err := encodeRegions(m.Regions)
		if err != nil {
			return err
		}
		if regions, err = marshal(rs); err != nil {
			return err
		}
	}

	var hdr [headerSize]byte
	copy(hdr[:], magic[:])
	binary.LittleEndian.PutUint16(hdr[8:], Major)
	binary.LittleEndian.PutUint16(hdr[10:], Minor)
	if _, err := w.Write(hdr[:]); err != nil {
		return fmt.Errorf("archive: writing: %w", err)
	}
	enc, err := zstd.NewWriter(w, zstd.WithEncoderConcurrency(1), zstd.WithWindowSize(MaxWindow/2), zstd.WithEncoderCRC(true))
	if err != nil {
		return fmt.Errorf("archive: starting compression: %w", err)
	}
	s := &sectionWriter{w: enc, buf: make([]byte, 0, chunk+64)}
	s.raw("meta", typeJSON, meta)
	if a.ModelSource != nil {
		s.raw("model", typeBytes, a.ModelSource)
	}
	if problem != nil {
		s.raw("problem", typeJSON, problem)
	}
	if a.Report != nil {
		s.raw("report", typeJSON, a.Report)
	}
	s.float64s("grid.x", g.X())
	s.float64s("grid.y", g.Y())
	s.raw("map.conductors", typeJSON, conds)
	if regions != nil {
		s.raw("map.regions", typeJSON, regions)
	}
	s.raw("map.sides", typeJSON, sides)
	s.raw("map.far", typeJSON, far)
	s.kinds("map.kind", m.Kind)
	s.int32s("map.cond", m.Cond)
	s.float64s("map.value", m.Value)
	s.float64s("map.eps", m.Eps)
	if m.EpsX != nil {
		s.float64s("map.epsx", m.EpsX)
		s.float64s("map.epsy", m.EpsY)
	}
	if m.Rho != nil {
		s.float64s("map.rho", m.Rho)
	}
	if m.Point != nil {
		s.float64s("map.point", m.Point)
	}
	s.float64s("map.cutx", m.CutX)
	s.float64s("map.cuty", m.CutY)
	if m.CellRegion != nil {
		s.int32s("map.cellregion", m.CellRegion)
	}
	if m.Surface != nil {
		s.crossings("map.surface", m.Surface)
	}
	s.float64s("phi", a.Phi)
	s.float64s("v", a.V)
	s.raw("end", typeBytes, nil)
	if s.err != nil {
		enc.Close()
		return fmt.Errorf("archive: writing: %w", s.err)
	}
	if err := enc.Close(); err != nil {
		return fmt.Errorf("archive: writing: %w", err)
	}
	return nil
}

// Save writes a to the file at path atomically: to a temporary file in the
// same directory, renamed to path when complete and removed on any error,
// so path never holds a partial archive.
func Save(path string, a *Archive) error {
	if err := export.AtomicWriteFile(path, func(w io.Writer) error { return Write(w, a) }); err != nil {
		return fmt.Errorf("archive: saving %s: %w", path, err)
	}
	return nil
}

// Load reads the archive file at path.
func Load(path string) (*Archive, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("archive: opening the result archive: %w", err)
	}
	defer f.Close()
	a, err := Read(bufio.NewReaderSize(f, 64<<10))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return a, nil
}

// Read reads an archive. Errors are *FormatError (matching ErrFormat) or
// *VersionError (matching ErrVersion); Read never panics on bad input and
// its memory grows only with the data actually present.
func Read(r io.Reader) (*Archive, error) {
	var hdr [headerSize]byte
	if n, err := io.ReadFull(r, hdr[:]); err != nil {
		if errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return nil, &FormatError{Offset: int64(n), Msg: "the file is shorter than the 12-byte archive header", Err: err}
	}
	if [8]byte(hdr[:8]) != magic {
		return nil, &FormatError{Offset: 0, Msg: "the file does not start with the phigrid archive signature"}
	}
	v := Version{int(binary.LittleEndian.Uint16(hdr[8:])), int(binary.LittleEndian.Uint16(hdr[10:]))}
	if v.Major != Major {
		return nil, &VersionError{Major: v.Major, Minor: v.Minor}
	}
	dec, err := zstd.NewReader(r, zstd.WithDecoderConcurrency(1), zstd.WithDecoderMaxWindow(MaxWindow), zstd.WithDecoderLowmem(true))
	if err != nil {
		return nil, &FormatError{Section: "payload", Offset: 0, Msg: "starting decompression", Err: err}
	}
	defer dec.Close()
	rd := &reader{s: sectionReader{r: &countingReader{r: dec}}}
	a, err := rd.read()
	if err != nil {
		return nil, err
	}
	a.Version = v
	return a, nil
}

// reader holds the state of one Read.
type reader struct {
	s    sectionReader
	meta metaJSON
	seen map[string]bool
}

func (rd *reader) read() (*Archive, error) {
	s := &rd.s
	if err := s.next(); err != nil {
		return nil, err
	}
	if s.name != "meta" {
		return nil, s.fail(nil, "the first section is %q, want meta", s.name)
	}
	if err := rd.readMeta(); err != nil {
		return nil, err
	}
	m := rd.meta
	nodes, cells := int64(m.Nx)*int64(m.Ny), int64(m.Nx-1)*int64(m.Ny-1)
	k := int64(m.Conductors)
	a := &Archive{ModelName: m.ModelName, Unit: Unit{m.Unit.Name, m.Unit.Scale}}
	mp := &bc.Map{Snapped: m.Snapped}
	var xs, ys []float64
	var problem []byte
	var mapFn [4]bool
	rd.seen = map[string]bool{"meta": true}
	for {
		if err := s.next(); err != nil {
			return nil, err
		}
		if s.name == "end" {
			if err := s.expect(typeBytes, 0); err != nil {
				return nil, err
			}
			break
		}
		if rd.seen[s.name] {
			return nil, s.fail(nil, "the section appears twice")
		}
		rd.seen[s.name] = true
		var err error
		f64 := func(dst *[]float64, count int64) {
			if err = s.expect(typeFloat64, count); err == nil {
				*dst, err = s.float64s()
			}
		}
		i32 := func(dst *[]int32, count int64) {
			if err = s.expect(typeInt32, count); err == nil {
				*dst, err = s.int32s()
			}
		}
		text := func(dst *[]byte, typ byte) {
			if err = s.expect(typ, -1); err == nil {
				*dst, err = s.bytes(MaxText)
			}
		}
		switch s.name {
		case "model":
			text(&a.ModelSource, typeBytes)
		case "problem":
			text(&problem, typeJSON)
		case "report":
			text(&a.Report, typeJSON)
			if err == nil && !json.Valid(a.Report) {
				err = s.fail(nil, "the report is not valid JSON")
			}
		case "grid.x":
			f64(&xs, int64(m.Nx))
		case "grid.y":
			f64(&ys, int64(m.Ny))
		case "map.conductors":
			var b []byte
			text(&b, typeJSON)
			if err == nil {
				var cs []conductorJSON
				if e := decodeJSON(b, &cs); e != nil {
					err = s.fail(e, "decoding the conductors")
				} else if int64(len(cs)) != k {
					err = s.fail(nil, "lists %d conductors, but meta says %d", len(cs), k)
				} else {
					mp.Conductors = decodeConductors(cs)
				}
			}
		case "map.regions":
			var b []byte
			text(&b, typeJSON)
			if err == nil {
				var rs []regionJSON
				if e := decodeJSON(b, &rs); e != nil {
					err = s.fail(e, "decoding the regions")
				} else if mp.Regions, e = decodeRegions(rs); e != nil {
					err = s.fail(e, "decoding the regions")
				} else if mp.Regions == nil {
					err = s.fail(nil, "the regions are null")
				}
			}
		case "map.sides":
			var b []byte
			text(&b, typeJSON)
			if err == nil {
				var sj [4]sideJSON
				if e := decodeJSON(b, &sj); e != nil {
					err = s.fail(e, "decoding the sides")
				} else if mp.Sides, mapFn, e = decodeSides(sj); e != nil {
					err = s.fail(e, "decoding the sides")
				}
			}
		case "map.far":
			var b []byte
			text(&b, typeJSON)
			if err == nil {
				var f farJSON
				if e := decodeJSON(b, &f); e != nil {
					err = s.fail(e, "decoding the far field")
				} else {
					mp.Far = bc.FarField{X: f.X, Y: f.Y, Decay: f.Decay}
				}
			}
		case "map.epsx":
			f64(&mp.EpsX, 2*cells)
		case "map.epsy":
			f64(&mp.EpsY, 2*cells)
		case "map.kind":
			if err = s.expect(typeUint8, nodes); err == nil {
				mp.Kind, err = s.kinds()
			}
		case "map.cond":
			i32(&mp.Cond, nodes)
		case "map.value":
			f64(&mp.Value, nodes)
		case "map.eps":
			f64(&mp.Eps, cells)
		case "map.rho":
			f64(&mp.Rho, cells)
		case "map.point":
			f64(&mp.Point, nodes)
		case "map.cutx":
			f64(&mp.CutX, nodes)
		case "map.cuty":
			f64(&mp.CutY, nodes)
		case "map.cellregion":
			i32(&mp.CellRegion, cells)
		case "map.surface":
			if err = s.expect(typeCrossing, -1); err == nil {
				if s.length/crossingSize > 4*uint64(nodes) {
					err = s.fail(nil, "holds %d crossings, more than 4 per node", s.length/crossingSize)
				} else {
					mp.Surface, err = s.crossings()
				}
			}
		case "phi":
			f64(&a.Phi, nodes)
		case "v":
			f64(&a.V, k)
		default:
			// A section of a later minor version.
			err = s.skip()
		}
		if err != nil {
			return nil, err
		}
	}
	// Reading to the end verifies the frame checksum and finds trailing
	// data.
	var one [1]byte
	if n, err := io.ReadFull(s.r, one[:]); n > 0 || !errors.Is(err, io.EOF) {
		if err == nil {
			err = errors.New("data follows the end section")
		}
		return nil, &FormatError{Section: "end", Offset: s.r.n, Msg: "the payload does not end cleanly after the end section", Err: err}
	}
	for _, name := range []string{"grid.x", "grid.y", "map.conductors", "map.sides", "map.far", "map.kind", "map.cond", "map.value", "map.eps", "map.cutx", "map.cuty", "phi", "v"} {
		if !rd.seen[name] {
			return nil, &FormatError{Section: name, Offset: -1, Msg: "this required section is missing"}
		}
	}
	metric, _ := parseMetric(m.Metric)
	g, err := grid.New(xs, ys, metric)
	if err != nil {
		return nil, &FormatError{Section: "grid.x", Offset: -1, Msg: "the axes do not make a grid", Err: err}
	}
	mp.Grid = g
	a.Grid, a.Map = g, mp
	var fn [4]bool
	if problem != nil {
		if a.Problem, fn, err = decodeProblem(problem); err != nil {
			return nil, &FormatError{Section: "problem", Offset: -1, Msg: "decoding the problem", Err: err}
		}
	}
	if err := a.check(); err != nil {
		return nil, &FormatError{Section: "payload", Offset: -1, Msg: "the sections do not fit together", Err: err}
	}
	for s := range fn {
		if fn[s] {
			a.Problem.Sides[s].Func = sideFunc(mp, s)
		}
		if mapFn[s] {
			mp.Sides[s].Func = sideFunc(mp, s)
		}
	}
	return a, nil
}

func (rd *reader) readMeta() error {
	s := &rd.s
	if err := s.expect(typeJSON, -1); err != nil {
		return err
	}
	b, err := s.bytes(1 << 20)
	if err != nil {
		return err
	}
	m := &rd.meta
	if err := decodeJSON(b, m); err != nil {
		return s.fail(err, "decoding the metadata")
	}
	if _, err := parseMetric(m.Metric); err != nil {
		return s.fail(err, "reading the metadata")
	}
	if m.Nx < 2 || m.Ny < 2 || m.Nx > MaxNodes || m.Ny > MaxNodes || int64(m.Nx)*int64(m.Ny) > MaxNodes {
		return s.fail(nil, "a grid of %d × %d nodes is outside 2 × 2 to %d nodes", m.Nx, m.Ny, MaxNodes)
	}
	if m.Conductors < 0 || m.Conductors > MaxConductors {
		return s.fail(nil, "%d conductors is outside 0 to %d", m.Conductors, MaxConductors)
	}
	if m.Snapped < 0 || int64(m.Snapped) > int64(m.Nx)*int64(m.Ny) {
		return s.fail(nil, "%d snapped nodes does not fit the grid", m.Snapped)
	}
	return nil
}
