package lowenergy

import (
	"bufio"
	"bytes"
	"embed"
	"errors"
	"fmt"
	"io"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"unicode"

	"github.com/conelight/conelight/geom/safefile"
)

//go:generate go run ./internal/gentables -config demo -out data/demo.txt
//go:generate go run ./internal/gentables -config large -out data/large.txt
//go:generate go run ./internal/gentables -config demo -sensor small -out data/demo-small-30.txt
//go:generate go run ./internal/gentables -config demo -sensor large -out data/demo-large-30.txt
//go:generate go run ./internal/gentables -config large -sensor small -out data/large-small-40.txt
//go:generate go run ./internal/gentables -config large -sensor medium -out data/large-medium-40.txt

//go:embed data/*.txt
var embeddedTables embed.FS

// Bin is one bin of a tabulated density: the interval [Lo, Hi) and the
// probability density (per unit of the tabulated variable) inside it.
type Bin struct {
	Lo, Hi, Density float64
}

// CalibrationPoint is one point of the energy calibration: at kinetic
// energy Ekin (MeV) the effective hit count of the fitted events has the
// Gaussian-core mean Mean and width Sigma, and the fitted vertex lies on
// average Shift cm ahead of the track start along the fitted direction
// (the light of a track is emitted along it), measured on Events events.
//
// DirSpread, ShiftSpread and VertexSpread are the event-to-event spreads
// the per-hit likelihoods cannot see, because all hits of an event share
// them: the spread (rad, per projected angle) of the fitted direction
// about the true one beyond the statistical errors of the direction
// likelihood (the electron's multiple scattering turns the light of the
// whole event together; the vertex error tilts every vertex-to-hit
// vector alike); the spread (cm) of the light-weighted centre ahead of
// the track start beyond the statistical vertex error along the track
// (the track length fluctuates); and the spread (cm, per axis) of the
// fitted light point across the track beyond its statistical error (the
// light of one event comes from one bent, extended track, while the
// residual density is that of all tracks, so the hits of an event share
// the mismatch). Each is the Gaussian-core variance of the calibration
// sample minus the mean squared statistical error, zero when that is
// negative. Zero means none is known.
type CalibrationPoint struct {
	Ekin, Mean, Sigma, Shift             float64
	Events                               int
	DirSpread, ShiftSpread, VertexSpread float64
}

// Tables holds the densities and the calibration a Fitter is built from.
// They come from the simulator (see the package documentation for the
// regeneration command) but are plain data: users may fill them from
// their own calibration.
type Tables struct {
	// Name identifies the table set (e.g. "demo", "large").
	Name string
	// TankRadius and TankHalfHeight (cm) are the sensor-surface size of the
	// detector the tables were made for (information only: New chooses
	// tables by their Dependencies, never by tank size).
	TankRadius, TankHalfHeight float64
	// TTS (ns, Gaussian sigma) is the transit-time spread the residual
	// table already contains (0 for the intrinsic table); New convolves it
	// with the rest of the sensor's TTS.
	TTS float64
	// Residual is the time-residual density (per ns) of signal hits at the
	// true vertex and time, without dark noise: the prompt peak from the
	// track extent and light dispersion, and the late tail from scattering
	// and reflection. Bins ordered and contiguous.
	Residual []Bin
	// Direction is the density (per unit cosine) of the cosine of the angle
	// between the track direction and the vertex-to-hit vector for prompt
	// signal hits, over [-1, 1].
	Direction []Bin
	// Energy is the calibration of the effective hit count against kinetic
	// energy, ordered by increasing Ekin.
	Energy []CalibrationPoint
	// Meta holds free-form provenance (generator settings, event counts).
	Meta map[string]string
}

// clone returns a deep copy of t.
func (t *Tables) clone() *Tables {
	c := *t
	c.Residual = slices.Clone(t.Residual)
	c.Direction = slices.Clone(t.Direction)
	c.Energy = slices.Clone(t.Energy)
	c.Meta = maps.Clone(t.Meta)
	return &c
}

// EmbeddedTables returns the table set embedded in the package under name
// ("demo" for the demo tank with medium sensors, "large" for the 40 m
// class tank with large sensors, "<tank>-<sensor class>-<coverage %>"
// for a built-in tank lined with another class; EmbeddedTableNames lists
// them).
func EmbeddedTables(name string) (*Tables, error) {
	b, err := embeddedTables.ReadFile("data/" + name + ".txt")
	if err != nil {
		return nil, fmt.Errorf("lowenergy: no embedded table set %q (have %s)", name, strings.Join(EmbeddedTableNames(), ", "))
	}
	return ReadTables(bytes.NewReader(b))
}

// EmbeddedTableNames lists the embedded table sets.
func EmbeddedTableNames() []string {
	ents, _ := embeddedTables.ReadDir("data")
	var names []string
	for _, e := range ents {
		names = append(names, strings.TrimSuffix(e.Name(), ".txt"))
	}
	sort.Strings(names)
	return names
}

// maxBins bounds the bins of a tabulated density (the embedded sets have
// a few hundred), and maxResidualSpan (ns) the span of the residual
// table: the fitter tabulates the residual density on a 0.1 ns grid per
// event, so both bound its memory and time.
const (
	maxBins         = 10000
	maxResidualSpan = 5000
)

// Validate checks the tables: finite non-negative densities on ordered,
// contiguous bins (at most 10,000; the residual table spanning at most
// 5,000 ns), a direction table inside [-1, 1], and a calibration with
// increasing energy and mean and non-negative event counts.
func (t *Tables) Validate() error {
	if t == nil {
		return errors.New("lowenergy: Tables is nil")
	}
	// Name and the Meta keys are single words and the Meta values single
	// lines, so that WriteTables writes a file ReadTables reads back.
	if strings.ContainsFunc(t.Name, unicode.IsSpace) {
		return fmt.Errorf("lowenergy: Tables.Name = %q must be one word", t.Name)
	}
	for k, v := range t.Meta {
		if k == "" || strings.ContainsFunc(k, unicode.IsSpace) || strings.ContainsAny(v, "\r\n") {
			return fmt.Errorf("lowenergy: Tables.Meta[%q] = %q: the key must be one word and the value one line", k, v)
		}
	}
	if !(t.TankRadius > 0 && t.TankHalfHeight > 0) || math.IsInf(t.TankRadius, 0) || math.IsInf(t.TankHalfHeight, 0) {
		return fmt.Errorf("lowenergy: Tables.TankRadius = %v, TankHalfHeight = %v must be positive and finite", t.TankRadius, t.TankHalfHeight)
	}
	if !(t.TTS >= 0) || math.IsInf(t.TTS, 0) {
		return fmt.Errorf("lowenergy: Tables.TTS = %v must be non-negative and finite", t.TTS)
	}
	if err := validateBins("Residual", t.Residual, math.Inf(-1), math.Inf(1)); err != nil {
		return err
	}
	if span := t.Residual[len(t.Residual)-1].Hi - t.Residual[0].Lo; span > maxResidualSpan {
		return fmt.Errorf("lowenergy: Tables.Residual spans %v ns, more than %v", span, maxResidualSpan)
	}
	if err := validateBins("Direction", t.Direction, -1, 1); err != nil {
		return err
	}
	if len(t.Energy) < 2 {
		return fmt.Errorf("lowenergy: Tables.Energy has %d points, need at least 2", len(t.Energy))
	}
	for i, p := range t.Energy {
		if !(p.Ekin > 0 && p.Mean > 0 && p.Sigma > 0) || math.IsInf(p.Ekin+p.Mean+p.Sigma, 0) || math.IsNaN(p.Shift) || math.IsInf(p.Shift, 0) || p.Events < 0 {
			return fmt.Errorf("lowenergy: Tables.Energy[%d] = %+v must have positive finite Ekin, Mean, Sigma, a finite Shift and non-negative Events", i, p)
		}
		if !(p.DirSpread >= 0 && p.DirSpread <= math.Pi) || !(p.ShiftSpread >= 0) || math.IsInf(p.ShiftSpread, 0) || !(p.VertexSpread >= 0) || math.IsInf(p.VertexSpread, 0) {
			return fmt.Errorf("lowenergy: Tables.Energy[%d] = %+v must have DirSpread in [0, pi] and finite non-negative ShiftSpread and VertexSpread", i, p)
		}
		if i > 0 && !(p.Ekin > t.Energy[i-1].Ekin && p.Mean > t.Energy[i-1].Mean) {
			return fmt.Errorf("lowenergy: Tables.Energy[%d] = %+v: Ekin and Mean must increase", i, p)
		}
	}
	return nil
}

func validateBins(name string, bins []Bin, lo, hi float64) error {
	if len(bins) < 2 || len(bins) > maxBins {
		return fmt.Errorf("lowenergy: Tables.%s has %d bins, need 2 to %d", name, len(bins), maxBins)
	}
	sum := 0.0
	for i, b := range bins {
		if !(b.Hi > b.Lo) || math.IsInf(b.Lo, 0) || math.IsInf(b.Hi, 0) || !(b.Density >= 0) || math.IsInf(b.Density, 0) {
			return fmt.Errorf("lowenergy: Tables.%s[%d] = %+v must have finite Lo < Hi and a finite non-negative Density", name, i, b)
		}
		if i > 0 && b.Lo != bins[i-1].Hi {
			return fmt.Errorf("lowenergy: Tables.%s[%d].Lo = %v does not continue bin %d (Hi = %v)", name, i, b.Lo, i-1, bins[i-1].Hi)
		}
		if b.Lo < lo-1e-12 || b.Hi > hi+1e-12 {
			return fmt.Errorf("lowenergy: Tables.%s[%d] = [%v, %v) outside [%v, %v]", name, i, b.Lo, b.Hi, lo, hi)
		}
		sum += b.Density * (b.Hi - b.Lo)
	}
	if !(sum > 0) {
		return fmt.Errorf("lowenergy: Tables.%s has zero integral", name)
	}
	return nil
}

// The table file format (our own): UTF-8 text, '#' starts a comment line.
//
//	name <name>
//	tank <sensor radius cm> <sensor half height cm>
//	tts <ns>
//	meta <key> <value...>
//	residual <n>          followed by n lines "lo hi density" (ns, 1/ns)
//	direction <n>         followed by n lines "lo hi density" (cosine)
//	energy <n>            followed by n lines "ekin mean sigma shift events
//	                      dirspread shiftspread vertexspread" (the last
//	                      three may be left out: zero)
//
// Each keyword appears at most once; counts are at most 10,000.

// ReadTables parses a table file and validates the tables
// (Tables.Validate). Errors name the line.
func ReadTables(r io.Reader) (*Tables, error) {
	t := &Tables{Meta: map[string]string{}}
	sc := bufio.NewScanner(r)
	line := 0
	next := func() ([]string, bool) {
		for sc.Scan() {
			line++
			s := strings.TrimSpace(sc.Text())
			if s == "" || strings.HasPrefix(s, "#") {
				continue
			}
			return strings.Fields(s), true
		}
		return nil, false
	}
	parse := func(f []string, n int) ([]float64, error) {
		if len(f) != n {
			return nil, fmt.Errorf("lowenergy: table line %d: want %d fields, have %d", line, n, len(f))
		}
		v := make([]float64, n)
		for i, s := range f {
			x, err := strconv.ParseFloat(s, 64)
			if err != nil {
				return nil, fmt.Errorf("lowenergy: table line %d: %v", line, err)
			}
			v[i] = x
		}
		return v, nil
	}
	readBins := func(n int) ([]Bin, error) {
		var bins []Bin
		for range n {
			f, ok := next()
			if !ok {
				return nil, fmt.Errorf("lowenergy: table ends inside a section at line %d", line)
			}
			v, err := parse(f, 3)
			if err != nil {
				return nil, err
			}
			bins = append(bins, Bin{v[0], v[1], v[2]})
		}
		return bins, nil
	}
	seen := map[string]bool{}
	for {
		f, ok := next()
		if !ok {
			break
		}
		if f[0] != "meta" {
			if seen[f[0]] {
				return nil, fmt.Errorf("lowenergy: table line %d: a second %q", line, f[0])
			}
			seen[f[0]] = true
		}
		count := func() (int, error) {
			if len(f) != 2 {
				return 0, fmt.Errorf("lowenergy: table line %d: %q wants a count", line, f[0])
			}
			n, err := strconv.Atoi(f[1])
			if err != nil || n < 0 || n > maxBins {
				return 0, fmt.Errorf("lowenergy: table line %d: bad count %q", line, f[1])
			}
			return n, nil
		}
		switch f[0] {
		case "name":
			if len(f) != 2 {
				return nil, fmt.Errorf("lowenergy: table line %d: name wants one word", line)
			}
			t.Name = f[1]
		case "tank":
			v, err := parse(f[1:], 2)
			if err != nil {
				return nil, err
			}
			t.TankRadius, t.TankHalfHeight = v[0], v[1]
		case "tts":
			v, err := parse(f[1:], 1)
			if err != nil {
				return nil, err
			}
			t.TTS = v[0]
		case "meta":
			if len(f) < 3 {
				return nil, fmt.Errorf("lowenergy: table line %d: meta wants a key and a value", line)
			}
			t.Meta[f[1]] = strings.Join(f[2:], " ")
		case "residual", "direction":
			n, err := count()
			if err != nil {
				return nil, err
			}
			bins, err := readBins(n)
			if err != nil {
				return nil, err
			}
			if f[0] == "residual" {
				t.Residual = bins
			} else {
				t.Direction = bins
			}
		case "energy":
			n, err := count()
			if err != nil {
				return nil, err
			}
			for range n {
				g, ok := next()
				if !ok {
					return nil, fmt.Errorf("lowenergy: table ends inside the energy section at line %d", line)
				}
				if len(g) != 5 && len(g) != 8 {
					return nil, fmt.Errorf("lowenergy: table line %d: want 5 or 8 fields, have %d", line, len(g))
				}
				spread := []float64{0, 0, 0}
				if len(g) == 8 {
					var err error
					if spread, err = parse(g[5:], 3); err != nil {
						return nil, err
					}
				}
				v, err := parse(g[:4], 4)
				if err != nil {
					return nil, err
				}
				events, err := strconv.Atoi(g[4])
				if err != nil || events < 0 {
					return nil, fmt.Errorf("lowenergy: table line %d: event count %q must be a non-negative integer", line, g[4])
				}
				t.Energy = append(t.Energy, CalibrationPoint{v[0], v[1], v[2], v[3], events, spread[0], spread[1], spread[2]})
			}
		default:
			return nil, fmt.Errorf("lowenergy: table line %d: unknown keyword %q", line, f[0])
		}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("lowenergy: reading tables: %w", err)
	}
	if err := t.Validate(); err != nil {
		return nil, err
	}
	return t, nil
}

// WriteTables writes t in the format ReadTables reads, every number in
// the shortest form that reads back exactly.
func WriteTables(w io.Writer, t *Tables) error {
	if err := t.Validate(); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "# conelight fit tables (format: see lowenergy.ReadTables)\n")
	if t.Name != "" {
		fmt.Fprintf(bw, "name %s\n", t.Name)
	}
	fmt.Fprintf(bw, "tank %g %g\ntts %g\n", t.TankRadius, t.TankHalfHeight, t.TTS)
	keys := make([]string, 0, len(t.Meta))
	for k := range t.Meta {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		fmt.Fprintf(bw, "meta %s %s\n", k, t.Meta[k])
	}
	for _, sec := range []struct {
		name string
		bins []Bin
	}{{"residual", t.Residual}, {"direction", t.Direction}} {
		fmt.Fprintf(bw, "%s %d\n", sec.name, len(sec.bins))
		for _, b := range sec.bins {
			fmt.Fprintf(bw, "%g %g %g\n", b.Lo, b.Hi, b.Density)
		}
	}
	fmt.Fprintf(bw, "energy %d\n", len(t.Energy))
	for _, p := range t.Energy {
		fmt.Fprintf(bw, "%g %g %g %g %d %g %g %g\n", p.Ekin, p.Mean, p.Sigma, p.Shift, p.Events, p.DirSpread, p.ShiftSpread, p.VertexSpread)
	}
	return bw.Flush()
}

// SaveTables writes t to path atomically (temporary file in the same
// directory, then rename).
func SaveTables(path string, t *Tables) error {
	return safefile.Write(path, func(w io.Writer) error { return WriteTables(w, t) })
}
