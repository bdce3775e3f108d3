package lowenergy

import (
	"crypto/sha256"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// TablesVersion is the version of the table method (what
// fit/lowenergy/internal/gentables measures and how). It is part of the
// tables' provenance hash: raise it when the method changes, and
// regenerate (go generate ./fit/lowenergy).
const TablesVersion = 2

// Dependencies are the detector facts a table set depends on, recorded in
// its Meta (keys "dep_*") by the generator. The residual table is
// intrinsic (the sensor's own transit-time spread is convolved in by
// New), but the direction table belongs to the prompt window, set by the
// sensor's timing; the energy calibration's occupancy correction
// depends on the sensor size and the coverage; every table depends on
// the water through the group velocity and the transmission of the
// detected light. The tank's size is not among them: the hits' geometry
// is computed for the detector at hand.
type Dependencies struct {
	// Sensor is the sensor class's name, TTS its transit-time spread
	// (ns) and CathodeDiameter its photocathode diameter (cm).
	Sensor               string
	TTS, CathodeDiameter float64
	// Coverage is the photocathode coverage of all sensors (dead ones
	// included).
	Coverage float64
	// GroupVelocity (cm/ns) and Transmission10m (the transmission of the
	// detected spectrum over 10 m) stand for the water.
	GroupVelocity, Transmission10m float64
}

// depTolerance is the relative difference within which a number of two
// Dependencies matches: the embedded sets' own measurements do not
// resolve smaller changes.
const depTolerance = 0.05

// DependenciesOf returns the dependencies of tables made for s.
func DependenciesOf(s setup.Setup) (Dependencies, error) {
	if err := s.Check(); err != nil {
		return Dependencies{}, fmt.Errorf("lowenergy: %w", err)
	}
	tank := s.Detector.Tank()
	diag := math.Hypot(2*tank.SensorRadius(), 2*tank.SensorHalfHeight())
	light, err := NewLight(s.Water, &s.Sensor, math.Max(diag, 1000))
	if err != nil {
		return Dependencies{}, err
	}
	return Dependencies{
		Sensor:          s.Sensor.Name,
		TTS:             s.Sensor.TTS,
		CathodeDiameter: s.Sensor.CathodeDiameter,
		Coverage:        s.Detector.Coverage(),
		GroupVelocity:   light.GroupVelocity,
		Transmission10m: light.Transmission(1000),
	}, nil
}

// depKeys are the Meta keys of the numbers of Dependencies, in order.
var depKeys = []string{"dep_tts_ns", "dep_cathode_diameter_cm", "dep_coverage", "dep_group_velocity_cm_per_ns", "dep_transmission_10m"}

func (d Dependencies) numbers() []float64 {
	return []float64{d.TTS, d.CathodeDiameter, d.Coverage, d.GroupVelocity, d.Transmission10m}
}

// Meta returns the Meta entries that record d, with the provenance hash
// (key "hash") of d, TablesVersion and the physics constants the
// generator uses.
func (d Dependencies) Meta() map[string]string {
	m := map[string]string{"dep_sensor": d.Sensor}
	for i, v := range d.numbers() {
		m[depKeys[i]] = strconv.FormatFloat(v, 'g', 6, 64)
	}
	m["tables_version"] = strconv.Itoa(TablesVersion)
	m["hash"] = provenanceHash(m)
	return m
}

// provenanceHash hashes the dependency entries of meta, TablesVersion and
// the physics constants (speed of light, electron mass).
func provenanceHash(meta map[string]string) string {
	keys := []string{"dep_sensor", "tables_version"}
	keys = append(keys, depKeys...)
	sort.Strings(keys)
	h := sha256.New()
	for _, k := range keys {
		fmt.Fprintf(h, "%s=%s\n", k, meta[k])
	}
	fmt.Fprintf(h, "c=%v\nme=%v\n", phys.SpeedOfLight, phys.ElectronMass)
	return fmt.Sprintf("%x", h.Sum(nil))[:16]
}

// Dependencies returns the dependencies recorded in t.Meta; false when t
// records none (tables made by hand or by an older generator).
func (t *Tables) Dependencies() (Dependencies, bool) {
	d := Dependencies{Sensor: t.Meta["dep_sensor"]}
	ptr := []*float64{&d.TTS, &d.CathodeDiameter, &d.Coverage, &d.GroupVelocity, &d.Transmission10m}
	for i, k := range depKeys {
		v, err := strconv.ParseFloat(t.Meta[k], 64)
		if err != nil {
			return Dependencies{}, false
		}
		*ptr[i] = v
	}
	return d, true
}

// Mismatch lists, one phrase each, where the detector's dependencies
// det differ from the tables' d by more than 5%.
func (d Dependencies) Mismatch(det Dependencies) []string {
	names := []string{"sensor transit-time spread (ns)", "sensor photocathode diameter (cm)", "photocathode coverage", "group velocity of the light in the water (cm/ns)", "transmission of the water over 10 m"}
	var out []string
	a, b := d.numbers(), det.numbers()
	for i := range a {
		if math.Abs(a[i]-b[i]) > depTolerance*math.Max(math.Abs(a[i]), math.Abs(b[i])) {
			out = append(out, fmt.Sprintf("%s %.3g in the tables, %.3g in the detector", names[i], a[i], b[i]))
		}
	}
	return out
}

// distance is a scale-free distance between two dependency sets, for
// choosing the nearest when none matches.
func (d Dependencies) distance(o Dependencies) float64 {
	s := 0.0
	a, b := d.numbers(), o.numbers()
	for i := range a {
		if a[i] > 0 && b[i] > 0 {
			s += math.Abs(math.Log(a[i] / b[i]))
		}
	}
	return s
}

// GenerateCommand is the command that makes tables for a detector no
// embedded set fits.
const GenerateCommand = "go run ./fit/lowenergy/internal/gentables -config demo|large -sensor small|medium|large -coverage C -out FILE (then ReadTables(FILE) into Config.Tables)"

// chooseEmbedded returns the embedded set whose dependencies match the
// detector's; when none does, the nearest, with a warning that names
// every mismatch and the command that makes matching tables.
func chooseEmbedded(s setup.Setup) (*Tables, string, error) {
	det, err := DependenciesOf(s)
	if err != nil {
		return nil, "", err
	}
	var best *Tables
	var bestMis []string
	bestD := math.Inf(1)
	for _, name := range EmbeddedTableNames() {
		t, err := EmbeddedTables(name)
		if err != nil {
			return nil, "", err
		}
		d, ok := t.Dependencies()
		if !ok {
			continue
		}
		mis := d.Mismatch(det)
		if len(mis) == 0 {
			return t, "", nil
		}
		if dist := d.distance(det); dist < bestD {
			best, bestMis, bestD = t, mis, dist
		}
	}
	if best == nil {
		return nil, "", fmt.Errorf("lowenergy: no embedded table set records its dependencies; regenerate them: go generate ./fit/lowenergy")
	}
	return best, fmt.Sprintf("lowenergy: no embedded table set fits this detector; using %q, which differs in: %s. Make matching tables with: %s",
		best.Name, strings.Join(bestMis, "; "), GenerateCommand), nil
}
