package ring

import (
	"fmt"
	"math"
	"slices"
	"sync"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring/internal/minimize"
	"github.com/conelight/conelight/fit/ring/internal/profile"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

// Hypothesis is a particle hypothesis of a single-ring fit.
type Hypothesis int

// The two hypotheses.
const (
	Electron Hypothesis = iota // e-like: a showering electron (or photon-like shower)
	Muon                       // mu-like: a muon track
)

// PDG returns the PDG code of the hypothesis (11 or 13).
func (h Hypothesis) PDG() int {
	if h == Muon {
		return phys.MuonMinus
	}
	return phys.Electron
}

// Mass returns the particle mass (MeV).
func (h Hypothesis) Mass() float64 {
	if h == Muon {
		return phys.MuonMass
	}
	return phys.ElectronMass
}

func (h Hypothesis) String() string {
	switch h {
	case Electron:
		return "electron"
	case Muon:
		return "muon"
	}
	return fmt.Sprintf("Hypothesis(%d)", int(h))
}

// Config describes the detector a Fitter reconstructs events of and how
// it fits.
type Config struct {
	// Setup is the detector: tank and sensors, sensor model, water, liner
	// and dead sensors, with the defaults of Setup.Check (nil Water means
	// pure water at 20 C). The liner's reflectivity sets the
	// reflected-light term; dead sensors are left out of the likelihood
	// and their hits ignored. The trigger is not used: Fit takes the
	// readout window of each event.
	setup.Setup
	// SkipUncertainties leaves out the Hessian and the Cramer-Rao bound,
	// which cost about as much as the fit itself.
	SkipUncertainties bool
	// MaxEvaluations bounds the likelihood evaluations of one hypothesis
	// fit; 0 means 3000.
	MaxEvaluations int
}

// Fitter reconstructs single-ring events in one detector. A Fitter is
// immutable after New and safe for concurrent use by any number of
// goroutines; per-call scratch is pooled.
type Fitter struct {
	cfg    Config
	pool   sync.Pool // of *workspace
	det    *geom.Detector
	tab    *tableSet
	resp   *response
	charge *chargeTable

	n                      int
	px, py, pz, nx, ny, nz []float64
	dead                   []bool
	live                   int

	cathodeArea  float64 // cm^2
	tts          float64 // ns
	darkGate     float64 // mean dark pe in one integration gate
	darkRate     float64 // per ns
	reflected    float64 // reflected-light fraction of the direct light
	lateTau      float64 // ns, decay constant of the indirect-light delay
	trackSigma   [2]float64
	maxEval      int
	tankRadius   float64
	tankHalfZ    float64
	energyLo     [2]float64
	energyHi     [2]float64
	tanCherenkov float64
	farDistance  float64 // farDistance, a field so that tests can move it
}

// New checks cfg and builds the response tables of the detector.
func New(cfg Config) (*Fitter, error) {
	if err := cfg.Setup.Check(); err != nil {
		return nil, fmt.Errorf("ring: Config: %w", err)
	}
	// The fitter keeps its own list: the caller's may change after New.
	cfg.Dead = slices.Clone(cfg.Dead)
	if cfg.MaxEvaluations < 0 {
		return nil, fmt.Errorf("ring: Config.MaxEvaluations = %d must not be negative", cfg.MaxEvaluations)
	}
	ts, err := tables()
	if err != nil {
		return nil, err
	}
	if n := profile.CherenkovIndex(cfg.Water, ts.bandLo, ts.bandHi); math.Abs(n-ts.index) > maxIndexMismatch {
		return nil, fmt.Errorf("ring: Config.Water has the Cherenkov-averaged refractive index %.5f over %g-%g nm; the emission tables were made for %.5f (water %s), which puts the ring's cone %.2f degrees off: make tables for this water (fit/ring/internal/gentables, go generate ./fit/ring)",
			n, ts.bandLo, ts.bandHi, ts.index, ts.water, (math.Acos(1/n)-math.Acos(1/ts.index))*180/math.Pi)
	}
	det := cfg.Detector
	t := det.Tank()
	r := t.Radius - t.SensorOffset
	h := t.Height/2 - t.SensorOffset
	maxR := 2.1 * math.Hypot(r, h)
	resp, err := newResponse(cfg.Water, &cfg.Sensor, ts.bandLo, ts.bandHi, maxR)
	if err != nil {
		return nil, err
	}
	ct, err := newChargeTable(&cfg.Sensor, modelSigma)
	if err != nil {
		return nil, err
	}
	n := det.NumSensors()
	f := &Fitter{cfg: cfg, det: det, tab: ts, resp: resp, charge: ct, n: n,
		px: make([]float64, n), py: make([]float64, n), pz: make([]float64, n),
		nx: make([]float64, n), ny: make([]float64, n), nz: make([]float64, n),
		dead: make([]bool, n)}
	for i := 0; i < n; i++ {
		s := det.Sensor(i)
		f.px[i], f.py[i], f.pz[i] = s.Pos.X, s.Pos.Y, s.Pos.Z
		f.nx[i], f.ny[i], f.nz[i] = s.Dir.X, s.Dir.Y, s.Dir.Z
	}
	for _, d := range cfg.Dead {
		f.dead[d] = true
	}
	f.live = n - len(cfg.Dead)
	m := cfg.Sensor
	D := det.CathodeDiameter()
	f.cathodeArea = math.Pi * D * D / 4
	f.tts = m.TTS
	f.darkRate = m.DarkRate * 1e-9
	f.darkGate = math.Max(m.DarkRate*m.IntegrationWindow*1e-9, 1e-7)
	f.reflected = cfg.Liner.Reflectivity * (1 - det.Coverage())
	// Scattered light arrives later by a fraction of the crossing time.
	f.lateTau = math.Max(0.5*r*resp.invGroup, 2)
	f.trackSigma = [2]float64{electronTimeSigma, muonTimeSigma}
	f.maxEval = cfg.MaxEvaluations
	if f.maxEval == 0 {
		f.maxEval = 3000
	}
	f.tankRadius, f.tankHalfZ = r, h
	for k, st := range []*speciesTable{ts.electron, ts.muon} {
		f.energyLo[k], f.energyHi[k] = st.energyRange()
	}
	f.tanCherenkov = math.Sqrt(resp.index*resp.index - 1)
	f.farDistance = farDistance
	return f, nil
}

// maxIndexMismatch is the largest difference between the refractive
// index of the detector's water and that of the tables New accepts: it
// turns the Cherenkov cone by 0.15 degrees, a tenth of the best direction
// resolution (a muon of a GeV, 0.5 degrees, package regression figures).
const maxIndexMismatch = 0.003

// EkinRange returns the kinetic energy range (MeV) of the emission
// tables of hypothesis h: fits are confined to it.
func (f *Fitter) EkinRange(h Hypothesis) (lo, hi float64) {
	return f.energyLo[h], f.energyHi[h]
}

func (f *Fitter) species(h Hypothesis) *speciesTable {
	if h == Muon {
		return f.tab.muon
	}
	return f.tab.electron
}

// workspace is the per-goroutine scratch of a Fitter: the predicted
// charges and times of every sensor and the event's hits in sensor order.
// A workspace is not safe for concurrent use.
type workspace struct {
	f    *Fitter
	prof profileAt
	muD  []float64 // direct mean pe
	muI  []float64 // indirect mean pe
	tDir []float64 // predicted direct-light time, ns
	sgT  []float64 // its spread, ns
	// The event: first hit of each sensor (hitQ < 0 for none).
	hitQ, hitT []float64
	hits       []int // hit sensors
	window     float64
	evals      int
	score      minimize.Scratch
	grid       stepGrid
	// allTimes makes predict fill the times of every sensor, not only
	// of the hit ones (Predict and the Cramer-Rao bound).
	allTimes bool
}

// newWorkspace returns a scratch space for f.
func (f *Fitter) newWorkspace() *workspace {
	n := f.n
	w := &workspace{f: f, muD: make([]float64, n), muI: make([]float64, n),
		tDir: make([]float64, n), sgT: make([]float64, n),
		hitQ: make([]float64, n), hitT: make([]float64, n)}
	for i := range w.hitQ {
		w.hitQ[i] = -1
	}
	return w
}

// workspace takes a scratch space from the pool; give it back with
// f.pool.Put.
func (f *Fitter) workspace() *workspace {
	if w, ok := f.pool.Get().(*workspace); ok {
		return w
	}
	return f.newWorkspace()
}

func (f *Fitter) checkTrack(h Hypothesis, tr fit.Track) error {
	if h != Electron && h != Muon {
		return fmt.Errorf("ring: hypothesis %d unknown", int(h))
	}
	v := tr.Vertex
	if !finite(v.X) || !finite(v.Y) || !finite(v.Z) || !finite(tr.Time) {
		return fmt.Errorf("ring: Track vertex %v, time %g must be finite", v, tr.Time)
	}
	if f.det.DistanceToWall(v) < 0 {
		return fmt.Errorf("ring: Track.Vertex %v lies outside the sensor surface", v)
	}
	d := tr.Dir.Norm()
	if !finite(d) || d < 1e-6 {
		return fmt.Errorf("ring: Track.Dir %v must be a finite non-zero vector", tr.Dir)
	}
	lo, hi := f.EkinRange(h)
	if !(tr.Ekin >= lo && tr.Ekin <= hi) {
		return fmt.Errorf("ring: Track.Ekin = %g MeV outside the %v table range %g-%g MeV", tr.Ekin, h, lo, hi)
	}
	return nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
