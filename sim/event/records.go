package event

import (
	"fmt"
	"strings"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// Tree names and the format identification stored in the run tree.
const (
	eventsTree   = "events"
	detectorTree = "detector"
	sensorTree   = "sensor"
	runTree      = "run"

	// FormatName and FormatVersion identify the file layout; they are
	// stored in the run tree. The version changes with any change of the
	// schema in the package documentation; Open reads every version from
	// oldestVersion on.
	FormatName    = "conelight-events"
	FormatVersion = 2
	oldestVersion = 1
)

// particleColumns holds one phys.Particle per entry (the neutrino's nucleon).
type particleColumns struct {
	PDG, Parent, Track        int32
	X, Y, Z, DX, DY, DZ, T, E float64
}

func (p *particleColumns) cols(prefix string) []column {
	return []column{
		{name: prefix + "pdg", ptr: &p.PDG},
		{name: prefix + "x", ptr: &p.X}, {name: prefix + "y", ptr: &p.Y}, {name: prefix + "z", ptr: &p.Z},
		{name: prefix + "dx", ptr: &p.DX}, {name: prefix + "dy", ptr: &p.DY}, {name: prefix + "dz", ptr: &p.DZ},
		{name: prefix + "t", ptr: &p.T}, {name: prefix + "ekin", ptr: &p.E},
		{name: prefix + "parent", ptr: &p.Parent}, {name: prefix + "track", ptr: &p.Track},
	}
}

func (p *particleColumns) set(q *phys.Particle) {
	*p = particleColumns{
		PDG: int32(q.PDG), Parent: int32(q.Parent), Track: int32(q.Track),
		X: q.Pos.X, Y: q.Pos.Y, Z: q.Pos.Z, DX: q.Dir.X, DY: q.Dir.Y, DZ: q.Dir.Z, T: q.Time, E: q.Ekin,
	}
}

func (p *particleColumns) particle() phys.Particle {
	return phys.Particle{
		PDG: int(p.PDG), Parent: int(p.Parent), Track: int(p.Track),
		Pos: r3.Vector{X: p.X, Y: p.Y, Z: p.Z}, Dir: r3.Vector{X: p.DX, Y: p.DY, Z: p.DZ}, Time: p.T, Ekin: p.E,
	}
}

// particleArrays holds a list of particles as parallel arrays.
type particleArrays struct {
	N                         int32
	PDG, Parent, Track        []int32
	X, Y, Z, DX, DY, DZ, T, E []float64
}

func (p *particleArrays) cols(prefix, count string) []column {
	return []column{
		{name: count, ptr: &p.N},
		{name: prefix + "pdg", ptr: &p.PDG, count: count},
		{name: prefix + "x", ptr: &p.X, count: count}, {name: prefix + "y", ptr: &p.Y, count: count}, {name: prefix + "z", ptr: &p.Z, count: count},
		{name: prefix + "dx", ptr: &p.DX, count: count}, {name: prefix + "dy", ptr: &p.DY, count: count}, {name: prefix + "dz", ptr: &p.DZ, count: count},
		{name: prefix + "t", ptr: &p.T, count: count}, {name: prefix + "ekin", ptr: &p.E, count: count},
		{name: prefix + "parent", ptr: &p.Parent, count: count}, {name: prefix + "track", ptr: &p.Track, count: count},
	}
}

func (p *particleArrays) set(ps []phys.Particle) {
	n := len(ps)
	p.N = int32(n)
	p.PDG, p.Parent, p.Track = resize(p.PDG, n), resize(p.Parent, n), resize(p.Track, n)
	p.X, p.Y, p.Z = resize(p.X, n), resize(p.Y, n), resize(p.Z, n)
	p.DX, p.DY, p.DZ = resize(p.DX, n), resize(p.DY, n), resize(p.DZ, n)
	p.T, p.E = resize(p.T, n), resize(p.E, n)
	for i := range ps {
		q := &ps[i]
		p.PDG[i], p.Parent[i], p.Track[i] = int32(q.PDG), int32(q.Parent), int32(q.Track)
		p.X[i], p.Y[i], p.Z[i] = q.Pos.X, q.Pos.Y, q.Pos.Z
		p.DX[i], p.DY[i], p.DZ[i] = q.Dir.X, q.Dir.Y, q.Dir.Z
		p.T[i], p.E[i] = q.Time, q.Ekin
	}
}

func (p *particleArrays) particles() []phys.Particle {
	if len(p.PDG) == 0 {
		return nil
	}
	ps := make([]phys.Particle, len(p.PDG))
	for i := range ps {
		ps[i] = phys.Particle{
			PDG: int(p.PDG[i]), Parent: int(p.Parent[i]), Track: int(p.Track[i]),
			Pos:  r3.Vector{X: p.X[i], Y: p.Y[i], Z: p.Z[i]},
			Dir:  r3.Vector{X: p.DX[i], Y: p.DY[i], Z: p.DZ[i]},
			Time: p.T[i], Ekin: p.E[i],
		}
	}
	return ps
}

func (p *particleArrays) lengthsAgree() bool {
	return allEqual(int(p.N), len(p.PDG), len(p.Parent), len(p.Track),
		len(p.X), len(p.Y), len(p.Z), len(p.DX), len(p.DY), len(p.DZ), len(p.T), len(p.E))
}

// allEqual reports whether every length equals n (groot sizes the arrays
// from their count branch; this guards the conversion below against a
// reader that did not).
func allEqual(n int, lengths ...int) bool {
	for _, l := range lengths {
		if l != n {
			return false
		}
	}
	return true
}

// eventRecord is one entry of the events tree.
type eventRecord struct {
	Number    uint64
	Primaries particleArrays

	NTrack                                        int32
	TrackPDG, TrackFate, TrackSecondaries         []int32
	TrackLength, TrackRange, TrackDecay, TrackVis []float64

	Photons, PE, DarkPE, PEDirect, PEScattered, PEReflected int64
	Triggered                                               bool
	TriggerTime                                             float64

	NuPDG, NuTarget, Process       int32
	NuEtot, NuDX, NuDY, NuDZ, NuQ2 float64
	Weight                         float64
	SourceEvent                    int64
	FromFile                       bool
	Nucleon                        particleColumns

	NHit               int32
	HitSensor          []int32
	HitTime, HitCharge []float64
}

// cols returns the columns of format version v (1 or 2). Version 1 had
// nu_energy for nu_etot and no process, weight or source columns.
func (r *eventRecord) cols(v int32) []column {
	etot := "nu_etot"
	if v == 1 {
		etot = "nu_energy"
	}
	cols := []column{{name: "number", ptr: &r.Number}}
	cols = append(cols, r.Primaries.cols("primary_", "n_primary")...)
	cols = append(cols,
		column{name: "n_track", ptr: &r.NTrack},
		column{name: "track_pdg", ptr: &r.TrackPDG, count: "n_track"},
		column{name: "track_length", ptr: &r.TrackLength, count: "n_track"},
		column{name: "track_range", ptr: &r.TrackRange, count: "n_track"},
		column{name: "track_fate", ptr: &r.TrackFate, count: "n_track"},
		column{name: "track_decay_time", ptr: &r.TrackDecay, count: "n_track"},
		column{name: "track_visible_photons", ptr: &r.TrackVis, count: "n_track"},
		column{name: "track_secondaries", ptr: &r.TrackSecondaries, count: "n_track"},
		column{name: "photons", ptr: &r.Photons},
		column{name: "pe", ptr: &r.PE},
		column{name: "pe_dark", ptr: &r.DarkPE},
		column{name: "pe_direct", ptr: &r.PEDirect},
		column{name: "pe_scattered", ptr: &r.PEScattered},
		column{name: "pe_reflected", ptr: &r.PEReflected},
		column{name: "triggered", ptr: &r.Triggered},
		column{name: "trigger_time", ptr: &r.TriggerTime},
		column{name: "nu_pdg", ptr: &r.NuPDG},
		column{name: etot, ptr: &r.NuEtot},
		column{name: "nu_dx", ptr: &r.NuDX},
		column{name: "nu_dy", ptr: &r.NuDY},
		column{name: "nu_dz", ptr: &r.NuDZ},
		column{name: "nu_q2", ptr: &r.NuQ2},
		column{name: "nu_target", ptr: &r.NuTarget},
	)
	if v >= 2 {
		cols = append(cols,
			column{name: "process", ptr: &r.Process},
			column{name: "weight", ptr: &r.Weight},
			column{name: "source_event", ptr: &r.SourceEvent},
			column{name: "from_file", ptr: &r.FromFile},
		)
	}
	cols = append(cols, r.Nucleon.cols("nucleon_")...)
	return append(cols,
		column{name: "n_hit", ptr: &r.NHit},
		column{name: "hit_sensor", ptr: &r.HitSensor, count: "n_hit"},
		column{name: "hit_time", ptr: &r.HitTime, count: "n_hit"},
		column{name: "hit_charge", ptr: &r.HitCharge, count: "n_hit"},
	)
}

// set fills r from a validated event, reusing r's slices.
func (r *eventRecord) set(e *Event) {
	t := &e.Truth
	r.Number = e.Number
	r.Primaries.set(t.Primaries)

	n := len(t.Tracks)
	r.NTrack = int32(n)
	r.TrackPDG, r.TrackFate, r.TrackSecondaries = resize(r.TrackPDG, n), resize(r.TrackFate, n), resize(r.TrackSecondaries, n)
	r.TrackLength, r.TrackRange = resize(r.TrackLength, n), resize(r.TrackRange, n)
	r.TrackDecay, r.TrackVis = resize(r.TrackDecay, n), resize(r.TrackVis, n)
	for i := range t.Tracks {
		tr := &t.Tracks[i]
		r.TrackPDG[i], r.TrackFate[i], r.TrackSecondaries[i] = int32(tr.PDG), int32(tr.Fate), int32(tr.Secondaries)
		r.TrackLength[i], r.TrackRange[i] = tr.Length, tr.Range
		r.TrackDecay[i], r.TrackVis[i] = tr.DecayTime, tr.VisiblePhotons
	}

	r.Photons, r.PE, r.DarkPE = int64(t.Photons), int64(t.Photoelectrons), int64(t.DarkPE)
	r.PEDirect, r.PEScattered, r.PEReflected = int64(t.PEDirect), int64(t.PEScattered), int64(t.PEReflected)
	r.Triggered, r.TriggerTime = t.Triggered, t.TriggerTime

	in := &t.Interaction
	r.NuPDG, r.NuTarget, r.Process = int32(in.PDG), int32(in.Target), int32(in.Process)
	r.NuEtot, r.NuQ2, r.Weight = in.Etot, in.Q2, in.Weight
	r.NuDX, r.NuDY, r.NuDZ = in.Dir.X, in.Dir.Y, in.Dir.Z
	r.SourceEvent, r.FromFile = in.SourceEvent, in.FromFile
	r.Nucleon.set(&in.Nucleon)

	n = len(e.Hits)
	r.NHit = int32(n)
	r.HitSensor, r.HitTime, r.HitCharge = resize(r.HitSensor, n), resize(r.HitTime, n), resize(r.HitCharge, n)
	for i, h := range e.Hits {
		r.HitSensor[i], r.HitTime[i], r.HitCharge[i] = int32(h.Sensor), h.Time, h.Charge
	}
}

// event builds a fresh Event from r; empty lists come back nil.
func (r *eventRecord) event() (Event, error) {
	if !r.Primaries.lengthsAgree() {
		return Event{}, fmt.Errorf("primary arrays disagree with n_primary = %d", r.Primaries.N)
	}
	nt := int(r.NTrack)
	if !allEqual(nt, len(r.TrackPDG), len(r.TrackFate), len(r.TrackSecondaries), len(r.TrackLength), len(r.TrackRange), len(r.TrackDecay), len(r.TrackVis)) {
		return Event{}, fmt.Errorf("track arrays disagree with n_track = %d", nt)
	}
	nh := int(r.NHit)
	if !allEqual(nh, len(r.HitSensor), len(r.HitTime), len(r.HitCharge)) {
		return Event{}, fmt.Errorf("hit arrays disagree with n_hit = %d", nh)
	}
	e := Event{
		Number: r.Number,
		Truth: Truth{
			Primaries:      r.Primaries.particles(),
			Photons:        int(r.Photons),
			Photoelectrons: int(r.PE),
			DarkPE:         int(r.DarkPE),
			PEDirect:       int(r.PEDirect),
			PEScattered:    int(r.PEScattered),
			PEReflected:    int(r.PEReflected),
			Triggered:      r.Triggered,
			TriggerTime:    r.TriggerTime,
			Interaction: Interaction{
				PDG: int(r.NuPDG), Etot: r.NuEtot, Q2: r.NuQ2, Target: int(r.NuTarget),
				Dir:     r3.Vector{X: r.NuDX, Y: r.NuDY, Z: r.NuDZ},
				Process: int(r.Process), Weight: r.Weight,
				SourceEvent: r.SourceEvent, FromFile: r.FromFile,
				Nucleon: r.Nucleon.particle(),
			},
		},
	}
	if nt > 0 {
		e.Truth.Tracks = make([]Track, nt)
		for i := range e.Truth.Tracks {
			e.Truth.Tracks[i] = Track{
				PDG: int(r.TrackPDG[i]), Fate: phys.Fate(r.TrackFate[i]), Secondaries: int(r.TrackSecondaries[i]),
				Length: r.TrackLength[i], Range: r.TrackRange[i], DecayTime: r.TrackDecay[i], VisiblePhotons: r.TrackVis[i],
			}
		}
	}
	if nh > 0 {
		e.Hits = make([]pmt.Hit, nh)
		for i := range e.Hits {
			e.Hits[i] = pmt.Hit{Sensor: int(r.HitSensor[i]), Time: r.HitTime[i], Charge: r.HitCharge[i]}
		}
	}
	return e, nil
}

// detectorRecord is the single entry of the detector tree.
type detectorRecord struct {
	TankRadius, TankHeight, SensorOffset, CathodeDiameter float64
	N                                                     int32
	X, Y, Z, DX, DY, DZ                                   []float64
	Surface                                               []int32
}

func (r *detectorRecord) cols() []column {
	return []column{
		{name: "tank_radius", ptr: &r.TankRadius},
		{name: "tank_height", ptr: &r.TankHeight},
		{name: "sensor_offset", ptr: &r.SensorOffset},
		{name: "cathode_diameter", ptr: &r.CathodeDiameter},
		{name: "n_sensor", ptr: &r.N},
		{name: "sensor_x", ptr: &r.X, count: "n_sensor"},
		{name: "sensor_y", ptr: &r.Y, count: "n_sensor"},
		{name: "sensor_z", ptr: &r.Z, count: "n_sensor"},
		{name: "sensor_dx", ptr: &r.DX, count: "n_sensor"},
		{name: "sensor_dy", ptr: &r.DY, count: "n_sensor"},
		{name: "sensor_dz", ptr: &r.DZ, count: "n_sensor"},
		{name: "sensor_surface", ptr: &r.Surface, count: "n_sensor"},
	}
}

func (r *detectorRecord) set(d *geom.Detector) {
	t := d.Tank()
	ss := d.Sensors()
	n := len(ss)
	*r = detectorRecord{
		TankRadius: t.Radius, TankHeight: t.Height, SensorOffset: t.SensorOffset, CathodeDiameter: d.CathodeDiameter(),
		N: int32(n),
		X: make([]float64, n), Y: make([]float64, n), Z: make([]float64, n),
		DX: make([]float64, n), DY: make([]float64, n), DZ: make([]float64, n),
		Surface: make([]int32, n),
	}
	for i, s := range ss {
		r.X[i], r.Y[i], r.Z[i] = s.Pos.X, s.Pos.Y, s.Pos.Z
		r.DX[i], r.DY[i], r.DZ[i] = s.Dir.X, s.Dir.Y, s.Dir.Z
		r.Surface[i] = int32(s.Surface)
	}
}

// detector rebuilds the detector with geom.NewDetector, which checks the
// stored surfaces against the positions.
func (r *detectorRecord) detector() (*geom.Detector, error) {
	n := int(r.N)
	if !allEqual(n, len(r.X), len(r.Y), len(r.Z), len(r.DX), len(r.DY), len(r.DZ), len(r.Surface)) {
		return nil, fmt.Errorf("sensor arrays disagree with n_sensor = %d", n)
	}
	ss := make([]geom.Sensor, n)
	for i := range ss {
		ss[i] = geom.Sensor{
			Index:   i,
			Pos:     r3.Vector{X: r.X[i], Y: r.Y[i], Z: r.Z[i]},
			Dir:     r3.Vector{X: r.DX[i], Y: r.DY[i], Z: r.DZ[i]},
			Surface: geom.Surface(r.Surface[i]),
		}
	}
	t := geom.Tank{Radius: r.TankRadius, Height: r.TankHeight, SensorOffset: r.SensorOffset}
	return geom.NewDetector(t, r.CathodeDiameter, ss)
}

// sensorRecord is the single entry of the sensor tree: a pmt.Model.
type sensorRecord struct {
	Name                                  string
	CathodeDiameter                       float64
	NQE, NAcc                             int32
	QEWavelength, QE, AccCos, Acc         []float64
	CE, TTS, SPEWidth, SPELowF, SPELowM   float64
	DarkRate, Threshold, Gate, Saturation float64
}

func (r *sensorRecord) cols() []column {
	return []column{
		{name: "name", ptr: &r.Name},
		{name: "cathode_diameter", ptr: &r.CathodeDiameter},
		{name: "n_qe", ptr: &r.NQE},
		{name: "qe_wavelength", ptr: &r.QEWavelength, count: "n_qe"},
		{name: "qe", ptr: &r.QE, count: "n_qe"},
		{name: "collection_efficiency", ptr: &r.CE},
		{name: "n_acceptance", ptr: &r.NAcc},
		{name: "acceptance_cos", ptr: &r.AccCos, count: "n_acceptance"},
		{name: "acceptance", ptr: &r.Acc, count: "n_acceptance"},
		{name: "tts", ptr: &r.TTS},
		{name: "spe_width", ptr: &r.SPEWidth},
		{name: "spe_low_fraction", ptr: &r.SPELowF},
		{name: "spe_low_mean", ptr: &r.SPELowM},
		{name: "dark_rate", ptr: &r.DarkRate},
		{name: "threshold", ptr: &r.Threshold},
		{name: "integration_window", ptr: &r.Gate},
		{name: "saturation", ptr: &r.Saturation},
	}
}

func (r *sensorRecord) set(m *pmt.Model) {
	qx, qy := m.QE.Points()
	ax, ay := m.Acceptance.Points()
	*r = sensorRecord{
		Name: m.Name, CathodeDiameter: m.CathodeDiameter,
		NQE: int32(len(qx)), QEWavelength: qx, QE: qy,
		NAcc: int32(len(ax)), AccCos: ax, Acc: ay,
		CE: m.CollectionEfficiency, TTS: m.TTS,
		SPEWidth: m.SPE.Width, SPELowF: m.SPE.LowFraction, SPELowM: m.SPE.LowMean,
		DarkRate: m.DarkRate, Threshold: m.Threshold, Gate: m.IntegrationWindow, Saturation: m.Saturation,
	}
}

// model rebuilds and validates the sensor model.
func (r *sensorRecord) model() (pmt.Model, error) {
	qe, err := pmt.NewCurve(r.QEWavelength, r.QE)
	if err != nil {
		return pmt.Model{}, fmt.Errorf("QE curve: %w", err)
	}
	acc, err := pmt.NewCurve(r.AccCos, r.Acc)
	if err != nil {
		return pmt.Model{}, fmt.Errorf("acceptance curve: %w", err)
	}
	m := pmt.Model{
		Name: r.Name, CathodeDiameter: r.CathodeDiameter, QE: qe, Acceptance: acc,
		CollectionEfficiency: r.CE, TTS: r.TTS,
		SPE:      pmt.SPE{Width: r.SPEWidth, LowFraction: r.SPELowF, LowMean: r.SPELowM},
		DarkRate: r.DarkRate, Threshold: r.Threshold, IntegrationWindow: r.Gate, Saturation: r.Saturation,
	}
	return m, m.Validate()
}

// runRecord is the single entry of the run tree.
type runRecord struct {
	Format                             string
	FormatVersion                      int32
	Seed                               uint64
	Generator, Version, Water, Options string
	ShardIndex, ShardCount             int32
	FirstEvent, Events                 uint64
	RunFirst, RunEvents                uint64
	Interrupted                        bool
	NMissing                           int32
	MissingFirst, MissingN             []uint64
	SourceRead, SourceSkipped          uint64
	SkipReasons                        string
	TrigThreshold                      int32
	TrigWindow, TrigPre, TrigPost      float64
	KeepUntriggered                    bool
}

// runShardColumns are the run columns that may differ between shards of
// one run: their place in it and what became of it.
var runShardColumns = []string{"shard_index", "first_event", "events", "interrupted",
	"n_missing", "missing_first", "missing_n", "source_read", "source_skipped", "skip_reasons"}

// versionColumns are the columns that identify the format, the first two
// of every version's run tree.
func (r *runRecord) versionColumns() []column {
	return []column{
		{name: "format", ptr: &r.Format},
		{name: "format_version", ptr: &r.FormatVersion},
	}
}

// cols returns the columns of format version v (1 or 2). Version 1 had
// no run range, interruption, missing spans or source accounting.
func (r *runRecord) cols(v int32) []column {
	cols := append(r.versionColumns(),
		column{name: "seed", ptr: &r.Seed},
		column{name: "generator", ptr: &r.Generator},
		column{name: "version", ptr: &r.Version},
		column{name: "water", ptr: &r.Water},
		column{name: "options", ptr: &r.Options},
		column{name: "shard_index", ptr: &r.ShardIndex},
		column{name: "shard_count", ptr: &r.ShardCount},
		column{name: "first_event", ptr: &r.FirstEvent},
		column{name: "events", ptr: &r.Events},
	)
	if v >= 2 {
		cols = append(cols,
			column{name: "run_first", ptr: &r.RunFirst},
			column{name: "run_events", ptr: &r.RunEvents},
			column{name: "interrupted", ptr: &r.Interrupted},
			column{name: "n_missing", ptr: &r.NMissing},
			column{name: "missing_first", ptr: &r.MissingFirst, count: "n_missing"},
			column{name: "missing_n", ptr: &r.MissingN, count: "n_missing"},
			column{name: "source_read", ptr: &r.SourceRead},
			column{name: "source_skipped", ptr: &r.SourceSkipped},
			column{name: "skip_reasons", ptr: &r.SkipReasons},
		)
	}
	return append(cols,
		column{name: "trigger_threshold", ptr: &r.TrigThreshold},
		column{name: "trigger_window", ptr: &r.TrigWindow},
		column{name: "trigger_pre", ptr: &r.TrigPre},
		column{name: "trigger_post", ptr: &r.TrigPost},
		column{name: "keep_untriggered", ptr: &r.KeepUntriggered},
	)
}

func (r *runRecord) set(ri *RunInfo) {
	*r = runRecord{
		Format: FormatName, FormatVersion: FormatVersion,
		Seed: ri.Seed, Generator: ri.Generator, Version: ri.Version, Water: ri.Water, Options: ri.Options,
		ShardIndex: int32(ri.ShardIndex), ShardCount: int32(ri.ShardCount),
		FirstEvent: ri.FirstEvent, Events: ri.Events,
		RunFirst: ri.Run.First, RunEvents: ri.Run.N,
		Interrupted: ri.Interrupted, NMissing: int32(len(ri.Missing)),
		MissingFirst: make([]uint64, len(ri.Missing)), MissingN: make([]uint64, len(ri.Missing)),
		SourceRead: ri.Source.Read, SourceSkipped: ri.Source.Skipped,
		SkipReasons:   strings.Join(ri.Source.Reasons, "\n"),
		TrigThreshold: int32(ri.Trigger.Threshold), TrigWindow: ri.Trigger.Window,
		TrigPre: ri.Trigger.PreTrigger, TrigPost: ri.Trigger.PostTrigger,
		KeepUntriggered: ri.KeepUntriggered,
	}
	for i, m := range ri.Missing {
		r.MissingFirst[i], r.MissingN[i] = m.First, m.N
	}
}

// checkVersion checks the format identification.
func (r *runRecord) checkVersion() error {
	if r.Format != FormatName {
		return fmt.Errorf("run format = %q, not %q: not a conelight event file", r.Format, FormatName)
	}
	if r.FormatVersion < oldestVersion || r.FormatVersion > FormatVersion {
		return fmt.Errorf("format_version = %d; this reader knows versions %d to %d", r.FormatVersion, oldestVersion, FormatVersion)
	}
	return nil
}

// run rebuilds the RunInfo; checkVersion has passed.
func (r *runRecord) run() (RunInfo, error) {
	ri := RunInfo{
		Seed: r.Seed, Generator: r.Generator, Version: r.Version, Water: r.Water, Options: r.Options,
		ShardIndex: int(r.ShardIndex), ShardCount: int(r.ShardCount),
		FirstEvent: r.FirstEvent, Events: r.Events,
		Run:         Span{First: r.RunFirst, N: r.RunEvents},
		Interrupted: r.Interrupted,
		Source:      SourceStats{Read: r.SourceRead, Skipped: r.SourceSkipped},
		Trigger: pmt.Trigger{
			Threshold: int(r.TrigThreshold), Window: r.TrigWindow,
			PreTrigger: r.TrigPre, PostTrigger: r.TrigPost,
		},
		KeepUntriggered: r.KeepUntriggered,
	}
	if !allEqual(int(r.NMissing), len(r.MissingFirst), len(r.MissingN)) {
		return RunInfo{}, fmt.Errorf("missing arrays disagree with n_missing = %d", r.NMissing)
	}
	for i := range r.MissingFirst {
		ri.Missing = append(ri.Missing, Span{First: r.MissingFirst[i], N: r.MissingN[i]})
	}
	if r.FormatVersion == 1 && ri.ShardCount == 1 {
		ri.Run = Span{First: ri.FirstEvent, N: ri.Events}
	}
	if r.SkipReasons != "" {
		ri.Source.Reasons = strings.Split(r.SkipReasons, "\n")
	}
	return ri, ri.Validate()
}
