package lowenergy

import (
	"fmt"
	"math"
	"slices"
	"sync"
	"time"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/setup"
)

// Config describes the detector a Fitter reconstructs events of and how
// hard the fit may work. Its zero values beyond the Setup are documented
// defaults.
type Config struct {
	// Setup is the detector: tank and sensors, sensor model, water, liner,
	// dead sensors (Setup.Check applies its defaults: nil Water means pure
	// water at 20 C). The fitter leaves the dead sensors out of the
	// likelihood, the occupancy correction and the dark-noise level, and
	// counts their hits in Result.DeadHits. It uses the readout window of
	// the trigger nowhere: the hit selection finds the event's light
	// itself. The liner enters through the tables: the light it reflects
	// arrives after the direct light and is part of the residual table's
	// late tail, made with the liner of the simulation that made the
	// tables (optics.DefaultLiner for the embedded sets); a much more
	// reflective liner wants tables made with it.
	setup.Setup
	// Tables are the densities and the energy calibration. Nil means the
	// embedded set whose recorded dependencies (sensor timing and size,
	// coverage, water: Dependencies) match the Setup's, or the nearest
	// with a warning (Fitter.TablesWarning) when none does.
	Tables *Tables
	// MaxIterations bounds the major iterations of each optimizer stage;
	// 0 means 200.
	MaxIterations int
	// MaxDuration bounds the run time of each optimizer stage; 0 means no
	// limit. A fit stopped by either limit has Status fit.NotConverged
	// with the optimizer's reason (IterationLimit, RuntimeLimit). A time
	// limit makes results depend on machine speed: use it as a guard in
	// productions, not in regression tests.
	MaxDuration time.Duration
}

// Fitter reconstructs low-energy events in one detector. A Fitter is
// immutable after New and safe for concurrent use by any number of
// goroutines; per-call scratch is pooled.
type Fitter struct {
	det      *geom.Detector
	sensor   pmt.Model
	tables   *Tables
	light    Light
	vg       float64     // effective group velocity, cm/ns
	pos, dir []r3.Vector // sensor positions and inward axes
	// scaled holds the sensor positions divided by vg (ns).
	scaled []r3.Vector
	// dead marks the sensors out of service; live counts the others.
	dead []bool
	live int

	res       residualModel
	selWindow float64 // ns, length of the hit-selection window
	darkPerNs float64 // expected dark hits per ns in the live sensors

	dirDensity         grid
	promptLo, promptHi float64 // ns, prompt residual window
	sigmaT             float64 // ns, prompt timing width used by the seed

	coarse        []r3.Vector // coarse seed grid inside the sensor surface
	coarseSpacing float64     // cm
	fibonacci     []r3.Vector // direction seed set

	nbStart, nb []int32 // live neighbour lists for the occupancy correction
	// coverage is the photocathode coverage of the live sensors.
	coverage float64
	// energySigma is the energy spread (MeV) at each calibration point.
	energySigma []float64

	// warning says why the chosen embedded tables do not fit the
	// detector (empty when they do or the caller gave tables).
	warning string

	maxIter int
	maxDur  time.Duration
	pool    sync.Pool
}

// New builds a Fitter. Errors name the bad field and its value.
func New(cfg Config) (*Fitter, error) {
	s := cfg.Setup
	s.Dead = slices.Clone(s.Dead)
	if err := s.Check(); err != nil {
		return nil, fmt.Errorf("lowenergy: %w", err)
	}
	if cfg.MaxDuration < 0 {
		return nil, fmt.Errorf("lowenergy: Config.MaxDuration = %v must not be negative", cfg.MaxDuration)
	}
	if cfg.MaxIterations < 0 {
		return nil, fmt.Errorf("lowenergy: Config.MaxIterations = %d must not be negative", cfg.MaxIterations)
	}
	n := s.Detector.NumSensors()
	tank := s.Detector.Tank()
	radius, half := tank.SensorRadius(), tank.SensorHalfHeight()
	tables := cfg.Tables
	var warning string
	if tables == nil {
		var err error
		if tables, warning, err = chooseEmbedded(s); err != nil {
			return nil, err
		}
	} else if err := tables.Validate(); err != nil {
		return nil, err
	} else {
		// The fitter keeps its own copy: a caller changing its tables
		// later changes no fit.
		tables = tables.clone()
	}
	diag := math.Hypot(2*radius, 2*half)
	light, err := NewLight(s.Water, &s.Sensor, diag)
	if err != nil {
		return nil, err
	}
	f := &Fitter{
		det:     s.Detector,
		sensor:  s.Sensor,
		tables:  tables,
		light:   light,
		vg:      light.GroupVelocity,
		maxIter: cfg.MaxIterations,
		warning: warning,
		maxDur:  cfg.MaxDuration,
	}
	if f.maxIter == 0 {
		f.maxIter = 200
	}
	f.pos = make([]r3.Vector, n)
	f.dir = make([]r3.Vector, n)
	f.scaled = make([]r3.Vector, n)
	for i := range n {
		sn := s.Detector.Sensor(i)
		f.pos[i], f.dir[i] = sn.Pos, sn.Dir
		f.scaled[i] = sn.Pos.Mul(1 / f.vg)
	}
	f.dead = make([]bool, n)
	for _, d := range s.Dead {
		f.dead[d] = true
	}
	f.live = n - len(s.Dead)

	// Timing: the table's own spread is removed from the sensor's.
	smear := math.Sqrt(math.Max(s.Sensor.TTS*s.Sensor.TTS-tables.TTS*tables.TTS, 0))
	smear = math.Max(smear, minSmear)
	signal := smearBins(tables.Residual, smear, gridStep)
	f.sigmaT = math.Hypot(s.Sensor.TTS, 1)
	// Every signal hit of a vertex inside the tank falls within the light
	// crossing time of the tank plus the late tail of the residual table.
	f.selWindow = diag/f.vg + math.Min(signal.hi(), 100)
	f.res = newResidualModel(signal, f.selWindow)
	// Dead sensors give no dark hits.
	f.darkPerNs = float64(f.live) * s.Sensor.DarkRate * 1e-9
	f.promptLo = -3*f.sigmaT - 2
	f.promptHi = 3*f.sigmaT + 8

	f.dirDensity = directionGrid(tables.Direction)
	// The light a dead sensor would have caught is lost like the light
	// between the sensors: the effective coverage is that of the live ones.
	f.coverage = s.Detector.Coverage() * float64(f.live) / float64(n)
	if !(f.coverage > 0) {
		return nil, fmt.Errorf("lowenergy: Config.Detector coverage = %v must be positive", f.coverage)
	}
	f.energySigma = energySpreads(tables.Energy)
	f.buildSeedGrid(radius, half)
	f.fibonacci = fibonacciSphere(200)
	f.buildNeighbours(math.Sqrt(tank.InnerArea() / float64(n)))
	f.pool.New = func() any { return newScratch(n) }
	return f, nil
}

// EkinRange returns the kinetic-energy range (MeV) of the fitter's energy
// calibration, its first and last points. Energies outside it are
// extrapolated linearly from the nearest two points and are not
// calibrated: callers choose this fitter for events inside the range.
func (f *Fitter) EkinRange() (lo, hi float64) {
	cal := f.tables.Energy
	return cal[0].Ekin, cal[len(cal)-1].Ekin
}

// TablesWarning returns, when Config.Tables was nil and no embedded set
// fits the detector (see Dependencies), a message naming each mismatch
// of the nearest set, which the fitter uses, and the command that makes
// matching tables; empty otherwise. Fits with mismatched tables run, but
// their biases and errors are those of another detector.
func (f *Fitter) TablesWarning() string { return f.warning }

// GroupVelocity returns the effective group velocity (cm/ns) the fitter
// converts path lengths to times with.
func (f *Fitter) GroupVelocity() float64 { return f.vg }

// Tables returns a copy of the tables the fitter was built from.
func (f *Fitter) Tables() *Tables { return f.tables.clone() }

// PromptWindow returns the time-residual window (ns) of the hits the
// direction and energy estimates use.
func (f *Fitter) PromptWindow() (lo, hi float64) { return f.promptLo, f.promptHi }

// buildSeedGrid lays a cubic grid of points inside the sensor surface at
// a spacing of a quarter of the larger of radius and half height.
func (f *Fitter) buildSeedGrid(radius, half float64) {
	s := math.Max(radius, half) / 4
	f.coarseSpacing = s
	nr := int(radius / s)
	nz := int(half / s)
	for iz := -nz; iz <= nz; iz++ {
		for iy := -nr; iy <= nr; iy++ {
			for ix := -nr; ix <= nr; ix++ {
				p := r3.Vector{X: float64(ix) * s, Y: float64(iy) * s, Z: float64(iz) * s}
				if math.Hypot(p.X, p.Y) < radius && math.Abs(p.Z) < half {
					f.coarse = append(f.coarse, p)
				}
			}
		}
	}
}

// fibonacciSphere returns n nearly uniform unit vectors.
func fibonacciSphere(n int) []r3.Vector {
	out := make([]r3.Vector, n)
	golden := math.Pi * (3 - math.Sqrt(5))
	for i := range n {
		z := 1 - (2*float64(i)+1)/float64(n)
		rho := math.Sqrt(1 - z*z)
		phi := golden * float64(i)
		out[i] = r3.Vector{X: rho * math.Cos(phi), Y: rho * math.Sin(phi), Z: z}
	}
	return out
}

// buildNeighbours lists, for each sensor, the live sensors within 2.5
// times the mean pitch, with a uniform hash grid (cell = radius). A dead
// sensor cannot be hit, so it is no neighbour: the occupancy is the hit
// fraction of the live sensors around a hit.
func (f *Fitter) buildNeighbours(pitch float64) {
	rad := 2.5 * pitch
	type key struct{ x, y, z int }
	cell := func(p r3.Vector) key {
		return key{int(math.Floor(p.X / rad)), int(math.Floor(p.Y / rad)), int(math.Floor(p.Z / rad))}
	}
	cells := map[key][]int32{}
	for i, p := range f.pos {
		k := cell(p)
		cells[k] = append(cells[k], int32(i))
	}
	f.nbStart = make([]int32, len(f.pos)+1)
	for i, p := range f.pos {
		k := cell(p)
		for dz := -1; dz <= 1; dz++ {
			for dy := -1; dy <= 1; dy++ {
				for dx := -1; dx <= 1; dx++ {
					for _, j := range cells[key{k.x + dx, k.y + dy, k.z + dz}] {
						if int(j) != i && !f.dead[j] && f.pos[j].Sub(p).Norm() < rad {
							f.nb = append(f.nb, j)
						}
					}
				}
			}
		}
		f.nbStart[i+1] = int32(len(f.nb))
	}
}
