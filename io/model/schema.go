package model

// The raw* types mirror the model file one to one. The TOML library decodes
// into them in strict mode, which rejects unknown keys and values of the
// wrong type; the decoder then checks presence, ranges and references and
// converts to SI. Field tags are the key names of the schema, and doc.go is
// the manual for them: keep the two in step.
//
// Numbers are float64 even where a count is meant (max_nodes, samples), so
// that 2e6 and 2_000_000 are both accepted (and gap = 4.0 too); the decoder checks that they are
// whole.

type rawFile struct {
	Title       string             `toml:"title"`
	Description string             `toml:"description"`
	Units       rawUnits           `toml:"units"`
	Domain      rawDomain          `toml:"domain"`
	Materials   map[string]float64 `toml:"materials"`
	Conductors  []rawConductor     `toml:"conductor"`
	Regions     []rawRegion        `toml:"region"`
	LineCharges []rawPointCharge   `toml:"line_charge"`
	RingCharges []rawPointCharge   `toml:"ring_charge"`
	Boundary    rawBoundary        `toml:"boundary"`
	Grid        rawGrid            `toml:"grid"`
	Solver      rawSolver          `toml:"solver"`
	Output      rawOutput          `toml:"output"`
}

type rawUnits struct {
	Length    string `toml:"length"`
	Potential string `toml:"potential"`
}

type rawDomain struct {
	Kind     string    `toml:"kind"`
	X        []float64 `toml:"x"`
	Y        []float64 `toml:"y"`
	Material string    `toml:"material"`
	EpsR     float64   `toml:"eps_r"`
}

type rawConductor struct {
	Name      string  `toml:"name"`
	Potential float64 `toml:"potential"`
	Floating  bool    `toml:"floating"`
	Charge    float64 `toml:"charge"`
}

type rawRegion struct {
	Name          string  `toml:"name"`
	Kind          string  `toml:"kind"`
	Conductor     string  `toml:"conductor"`
	Material      string  `toml:"material"`
	EpsR          float64 `toml:"eps_r"`
	ChargeDensity float64 `toml:"charge_density"`

	Rect    *rawRect    `toml:"rect"`
	Circle  *rawCircle  `toml:"circle"`
	Ellipse *rawEllipse `toml:"ellipse"`
	Annulus *rawAnnulus `toml:"annulus"`
	Polygon *rawPolygon `toml:"polygon"`
	Strip   *rawStrip   `toml:"strip"`
}

type rawRect struct {
	X []float64 `toml:"x"`
	Y []float64 `toml:"y"`
}

type rawCircle struct {
	Center []float64 `toml:"center"`
	Radius float64   `toml:"radius"`
}

type rawEllipse struct {
	Center   []float64 `toml:"center"`
	SemiAxes []float64 `toml:"semi_axes"`
}

type rawAnnulus struct {
	Center      []float64 `toml:"center"`
	InnerRadius float64   `toml:"inner_radius"`
	OuterRadius float64   `toml:"outer_radius"`
}

type rawPolygon struct {
	Points [][]float64 `toml:"points"`
}

type rawStrip struct {
	From      []float64 `toml:"from"`
	To        []float64 `toml:"to"`
	Thickness float64   `toml:"thickness"`
}

type rawPointCharge struct {
	Name   string    `toml:"name"`
	At     []float64 `toml:"at"`
	Charge float64   `toml:"charge"`
}

type rawBoundary struct {
	Left   *rawSide `toml:"left"`
	Right  *rawSide `toml:"right"`
	Bottom *rawSide `toml:"bottom"`
	Top    *rawSide `toml:"top"`
	Far    *rawFar  `toml:"far"`
}

type rawSide struct {
	Kind      string  `toml:"kind"`
	Potential float64 `toml:"potential"`
	Conductor string  `toml:"conductor"`
}

type rawFar struct {
	Center []float64 `toml:"center"`
	Decay  float64   `toml:"decay"`
	Extend float64   `toml:"extend"`
}

type rawGrid struct {
	Cell     float64 `toml:"cell"`
	Refine   float64 `toml:"refine"`
	Ratio    float64 `toml:"ratio"`
	Gap      float64 `toml:"gap"`
	Corner   float64 `toml:"corner"`
	MaxNodes float64 `toml:"max_nodes"`
}

type rawSolver struct {
	Method        string  `toml:"method"`
	Tolerance     float64 `toml:"tolerance"`
	MaxIterations float64 `toml:"max_iterations"`
}

type rawOutput struct {
	Directory string       `toml:"directory"`
	Report    bool         `toml:"report"`
	CSV       bool         `toml:"csv"`
	NPY       bool         `toml:"npy"`
	VTK       bool         `toml:"vtk"`
	Archive   bool         `toml:"archive"`
	Pictures  []rawPicture `toml:"picture"`
	Probes    []rawProbe   `toml:"probe"`
	Cuts      []rawCut     `toml:"cut"`
}

type rawPicture struct {
	Kind        string  `toml:"kind"`
	File        string  `toml:"file"`
	Width       float64 `toml:"width"`
	Height      float64 `toml:"height"`
	Contours    float64 `toml:"contours"`
	LogScale    bool    `toml:"log_scale"`
	ArrowLength string  `toml:"arrow_length"`
	Lines       float64 `toml:"lines"`
}

type rawProbe struct {
	Name string    `toml:"name"`
	At   []float64 `toml:"at"`
}

type rawCut struct {
	Name    string    `toml:"name"`
	From    []float64 `toml:"from"`
	To      []float64 `toml:"to"`
	Samples float64   `toml:"samples"`
}
