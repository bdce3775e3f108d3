// Command gentables makes the tables package fit embeds, from the event
// simulator: the intrinsic time-residual density, the direction-cosine
// density and the energy calibration. Run it through go generate in the
// fit directory:
//
//	go generate ./fit/lowenergy
//
// or for one table set:
//
//	go run ./fit/lowenergy/internal/gentables -config large -out fit/lowenergy/data/large.txt
//
// Three samples of electrons, uniform in the fiducial volume (-fiducial cm
// from the sensor surface) with isotropic directions, are simulated:
//
//  1. Residual table: sensors without transit-time spread and without
//     dark noise; every hit's residual t - t_true - |x - v_true| / v_g at
//     the true vertex and time (v_g from lowenergy.NewLight) is histogrammed on
//     variable bins. fit convolves it with the sensor's Gaussian TTS.
//  2. Direction table: the real sensor, no dark noise; the cosine between
//     the true direction and the true-vertex-to-hit vector of hits inside
//     the fitter's prompt residual window.
//  3. Energy calibration: the real sensor with dark noise and the default
//     trigger; each triggered event is fitted with the tables of steps 1
//     and 2, and the Gaussian core of the effective hit count at each
//     energy is recorded, with the vertex shift and the event-to-event
//     spreads of the direction, the shift and the light point across
//     the track that the statistical errors miss (lowenergy.CalibrationPoint).
//
// The tables record the detector facts they depend on and a provenance
// hash (lowenergy.Dependencies). For a detector no embedded set fits,
// -sensor and -coverage line the config's tank anew:
//
//	go run ./fit/lowenergy/internal/gentables -config demo -sensor small -coverage 0.2 -out mytables.txt
package main

import (
	"flag"
	"fmt"
	"log"
	"maps"
	"math"
	"strings"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/internal/sample"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
)

func main() {
	configName := flag.String("config", "demo", "detector: demo (demo tank, medium sensors, 30%) or large (large tank, large sensors, 40%)")
	out := flag.String("out", "", "output table file (required)")
	seed := flag.Uint64("seed", 1, "run seed")
	nShape := flag.Int("events", 6000, "events for each of the residual and direction tables")
	nCal := flag.Int("calib", 1000, "events per calibration energy")
	withTTS := flag.Bool("sensor-tts", false, "tabulate residuals with the sensor's own TTS instead of the intrinsic (TTS = 0) density")
	fiducial := flag.Float64("fiducial", 0, "fiducial distance from the sensor surface, cm (0: 100 demo, 200 large)")
	sensor := flag.String("sensor", "", "sensor class replacing the config's own: small, medium or large (empty: the config's)")
	coverage := flag.Float64("coverage", 0, "photocathode coverage replacing the config's own, in (0, 0.9) (0: the config's)")
	flag.Parse()
	if *out == "" {
		log.Fatal("gentables: -out is required")
	}
	cfg, fid, err := config(*configName, *seed)
	if err != nil {
		log.Fatal(err)
	}
	if *fiducial > 0 {
		fid = *fiducial
	}
	name := *configName
	if *sensor != "" || *coverage != 0 {
		if cfg, err = relined(cfg, *sensor, *coverage); err != nil {
			log.Fatal(err)
		}
		name = fmt.Sprintf("%s-%s-%.0f", name, strings.ToLower(cfg.Sensor.Name), 100*cfg.Detector.Coverage())
	}
	t, err := generate(name, cfg, fid, *seed, *nShape, *nCal, *withTTS)
	if err != nil {
		log.Fatal(err)
	}
	if err := lowenergy.SaveTables(*out, t); err != nil {
		log.Fatal(err)
	}
}

// relined returns cfg with its tank lined anew (geom.Layout) with the
// named sensor class and coverage (empty or 0: the config's own).
func relined(cfg sim.Config, sensor string, coverage float64) (sim.Config, error) {
	switch sensor {
	case "":
	case "small":
		cfg.Sensor = pmt.Small()
	case "medium":
		cfg.Sensor = pmt.Medium()
	case "large":
		cfg.Sensor = pmt.Large()
	default:
		return cfg, fmt.Errorf("gentables: -sensor %q: want small, medium or large", sensor)
	}
	if coverage == 0 {
		coverage = cfg.Detector.Coverage()
	}
	if !(coverage > 0 && coverage < 0.9) {
		return cfg, fmt.Errorf("gentables: -coverage %v: want a value in (0, 0.9)", coverage)
	}
	det, err := geom.Layout(cfg.Detector.Tank(), cfg.Sensor.CathodeDiameter, coverage)
	if err != nil {
		return cfg, fmt.Errorf("gentables: %w", err)
	}
	cfg.Detector = det
	cfg.Dead = nil
	return cfg, nil
}

func config(name string, seed uint64) (sim.Config, float64, error) {
	switch name {
	case "demo":
		c, err := sim.DemoConfig(seed)
		return c, 100, err
	case "large":
		c, err := sample.LargeConfig(seed)
		return c, 200, err
	}
	return sim.Config{}, 0, fmt.Errorf("gentables: unknown -config %q (demo, large)", name)
}

func generate(name string, cfg sim.Config, fid float64, seed uint64, nShape, nCal int, withTTS bool) (*lowenergy.Tables, error) {
	tank := cfg.Detector.Tank()
	diag := math.Hypot(2*tank.SensorRadius(), 2*tank.SensorHalfHeight())
	light, err := lowenergy.NewLight(cfg.Water, &cfg.Sensor, diag)
	if err != nil {
		return nil, err
	}
	vg := light.GroupVelocity
	shapeEnergy := func(i int) float64 { return []float64{5, 10, 20}[i%3] }

	// 1. Intrinsic residuals.
	intrinsic := cfg
	if !withTTS {
		intrinsic.Sensor.TTS = 0
	}
	intrinsic.NoDarkNoise = true
	evs, err := sample.Simulate(intrinsic, fid, 0, nShape, shapeEnergy)
	if err != nil {
		return nil, err
	}
	hiR := math.Max(math.Ceil(1.5*diag/vg/10)*10, 150)
	edges := residualEdges(hiR)
	counts := make([]float64, len(edges)-1)
	total := 0
	for _, ev := range evs {
		p := ev.Truth.Primaries[0]
		for _, h := range ev.Hits {
			r := h.Time - p.Time - cfg.Detector.Sensor(h.Sensor).Pos.Sub(p.Pos).Norm()/vg
			total++
			if k := findBin(edges, r); k >= 0 {
				counts[k]++
			}
		}
	}
	t := &lowenergy.Tables{
		Name:           name,
		TankRadius:     tank.SensorRadius(),
		TankHalfHeight: tank.SensorHalfHeight(),
		TTS:            intrinsic.Sensor.TTS,
		Residual:       toDensity(edges, counts, float64(total)),
		Meta: map[string]string{
			"generator":   "fit/lowenergy/internal/gentables",
			"seed":        fmt.Sprint(seed),
			"sensor":      cfg.Sensor.Name,
			"coverage":    fmt.Sprintf("%.3f", cfg.Detector.Coverage()),
			"fiducial_cm": fmt.Sprint(fid),
			"shape":       fmt.Sprintf("%d electrons at 5, 10, 20 MeV; residual hits %d", nShape, total),
		},
		// Placeholder calibration until step 3 (Neff does not depend on it).
		Energy: []lowenergy.CalibrationPoint{{Ekin: 1, Mean: 1, Sigma: 1}, {Ekin: 2, Mean: 2, Sigma: 1}},
	}

	// 2. Direction cosines of prompt hits, real sensor timing.
	dirBins := 100
	dirCounts := make([]float64, dirBins)
	dirEdges := make([]float64, dirBins+1)
	for i := range dirEdges {
		dirEdges[i] = -1 + 2*float64(i)/float64(dirBins)
	}
	t.Direction = uniformDensity(dirEdges)
	provisional, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup, Tables: t})
	if err != nil {
		return nil, err
	}
	lo, hi := provisional.PromptWindow()
	direct := cfg
	direct.NoDarkNoise = true
	evs, err = sample.Simulate(direct, fid, uint64(nShape), nShape, shapeEnergy)
	if err != nil {
		return nil, err
	}
	nDir := 0
	for _, ev := range evs {
		p := ev.Truth.Primaries[0]
		for _, h := range ev.Hits {
			d := cfg.Detector.Sensor(h.Sensor).Pos.Sub(p.Pos)
			r := h.Time - p.Time - d.Norm()/vg
			if r < lo || r > hi {
				continue
			}
			if k := findBin(dirEdges, d.Normalize().Dot(p.Dir)); k >= 0 {
				dirCounts[k]++
				nDir++
			}
		}
	}
	t.Direction = toDensity(dirEdges, dirCounts, float64(nDir))
	t.Meta["direction"] = fmt.Sprintf("%d prompt hits in [%.2f, %.2f] ns", nDir, lo, hi)

	// 3. Energy calibration with full fits.
	fitter, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup, Tables: t})
	if err != nil {
		return nil, err
	}
	energies := []float64{3, 5, 7, 10, 15, 20, 30, 50, 70, 100}
	if name == "large" {
		// At 3 MeV only about half the events trigger in the large tank
		// and their fits are too poor to calibrate with.
		energies = energies[1:]
	}
	var cal []lowenergy.CalibrationPoint
	for k, e := range energies {
		evs, err := sample.Simulate(cfg, fid, uint64(2*nShape+k*nCal), nCal, func(int) float64 { return e })
		if err != nil {
			return nil, err
		}
		var neff, shift, angle, angleVar, alongVar, across, acrossVar []float64
		for _, ev := range evs {
			if !ev.Truth.Triggered {
				continue
			}
			r, err := fitter.Fit(ev.Hits)
			if err != nil {
				return nil, err
			}
			if r.Status == fit.Converged {
				neff = append(neff, r.Neff)
				p := ev.Truth.Primaries[0]
				d := r.Track.Dir
				shift = append(shift, r.Track.Vertex.Sub(p.Pos).Dot(d))
				// The calibration's own tables have no spreads yet, so
				// the fit's errors are the statistical ones.
				c := [3]float64{d.X, d.Y, d.Z}
				v := 0.0
				for i := range 3 {
					for j := range 3 {
						v += c[i] * r.Cov[i][j] * c[j]
					}
				}
				alongVar = append(alongVar, v)
				e1, e2 := phys.Basis(d)
				light := r.Track.Vertex.Add(d.Mul(r.Shift)).Sub(p.Pos)
				for _, u := range []r3.Vector{e1, e2} {
					c := [3]float64{u.X, u.Y, u.Z}
					v := 0.0
					for i := range 3 {
						for j := range 3 {
							v += c[i] * r.Cov[i][j] * c[j]
						}
					}
					across = append(across, light.Dot(u))
					acrossVar = append(acrossVar, v)
				}
				if r.ErrorsValid {
					angle = append(angle, p.Dir.Dot(e1), p.Dir.Dot(e2))
					angleVar = append(angleVar, r.AngleStat[0]*r.AngleStat[0], r.AngleStat[1]*r.AngleStat[1])
				}
			}
		}
		g, err := resolution.GaussianCore(neff, 2)
		if err != nil {
			return nil, fmt.Errorf("gentables: calibration at %v MeV: %w", e, err)
		}
		gs, err := resolution.GaussianCore(shift, 2)
		if err != nil {
			return nil, fmt.Errorf("gentables: vertex shift at %v MeV: %w", e, err)
		}
		dirSpread, err := excess(angle, angleVar)
		if err != nil {
			return nil, err
		}
		along := make([]float64, len(shift))
		for i, v := range shift {
			along[i] = v - gs.Mean.Value
		}
		shiftSpread, err := excess(along, alongVar)
		if err != nil {
			return nil, err
		}
		vertexSpread, err := excess(across, acrossVar)
		if err != nil {
			return nil, err
		}
		highland, err := scatterSpread(e)
		if err != nil {
			return nil, err
		}
		cal = append(cal, lowenergy.CalibrationPoint{Ekin: e, Mean: g.Mean.Value, Sigma: g.Sigma.Value, Shift: gs.Mean.Value, Events: len(neff),
			DirSpread: dirSpread, ShiftSpread: shiftSpread, VertexSpread: vertexSpread})
		log.Printf("%s: %5.1f MeV: Neff %.1f sigma %.1f shift %.1f cm spread %.1f cm, across %.1f cm, direction spread %.3f rad (multiple scattering of the light-weighted direction %.3f) (%d fitted of %d)",
			name, e, g.Mean.Value, g.Sigma.Value, gs.Mean.Value, shiftSpread, vertexSpread, dirSpread, highland, len(neff), nCal)
		t.Meta[fmt.Sprintf("scattering_%g_MeV", e)] = fmt.Sprintf("%.4f rad", highland)
	}
	t.Energy = cal
	deps, err := lowenergy.DependenciesOf(cfg.Setup)
	if err != nil {
		return nil, err
	}
	maps.Copy(t.Meta, deps.Meta())
	t.Meta["calibration"] = fmt.Sprintf("%d electrons per energy, triggered and converged fits, Gaussian cores (2 sigma) of Neff, of the vertex shift along the fitted direction, of the light point across it and of the projected direction angles; spreads are the excess in quadrature that gives unit Gaussian-core pull width", nCal)
	return t, t.Validate()
}

// residualEdges returns variable bin edges: fine around the prompt peak,
// coarser in the tail up to hi ns.
func residualEdges(hi float64) []float64 {
	var e []float64
	add := func(from, to, step float64) {
		for x := from; x < to-1e-9; x += step {
			e = append(e, math.Round(x*1000)/1000)
		}
	}
	add(-10, -3, 0.5)
	add(-3, 5, 0.1)
	add(5, 15, 0.25)
	add(15, 40, 1)
	add(40, 100, 2.5)
	add(100, hi, 10)
	return append(e, hi)
}

func findBin(edges []float64, x float64) int {
	if x < edges[0] || x >= edges[len(edges)-1] {
		return -1
	}
	lo, hi := 0, len(edges)-1
	for hi-lo > 1 {
		m := (lo + hi) / 2
		if x >= edges[m] {
			lo = m
		} else {
			hi = m
		}
	}
	return lo
}

func toDensity(edges, counts []float64, total float64) []lowenergy.Bin {
	bins := make([]lowenergy.Bin, len(counts))
	for i := range counts {
		w := edges[i+1] - edges[i]
		bins[i] = lowenergy.Bin{Lo: edges[i], Hi: edges[i+1], Density: counts[i] / (total * w)}
	}
	return bins
}

func uniformDensity(edges []float64) []lowenergy.Bin {
	bins := make([]lowenergy.Bin, len(edges)-1)
	span := edges[len(edges)-1] - edges[0]
	for i := range bins {
		bins[i] = lowenergy.Bin{Lo: edges[i], Hi: edges[i+1], Density: 1 / span}
	}
	return bins
}

// excess returns the spread v shared by the events of a sample beyond
// their statistical variances: the v >= 0 for which the deviations
// dev[i] / sqrt(stat[i] + v^2) have a Gaussian core (2 sigma) of unit
// width, 0 when they are narrower already. It is found by bisection (the
// width falls as v grows).
func excess(dev, stat []float64) (float64, error) {
	if len(dev) == 0 {
		return 0, nil
	}
	width := func(v float64) (float64, error) {
		p := make([]float64, len(dev))
		for i := range dev {
			p[i] = dev[i] / math.Sqrt(stat[i]+v*v)
		}
		g, err := resolution.GaussianCore(p, 2)
		return g.Sigma.Value, err
	}
	w0, err := width(0)
	if err != nil || w0 <= 1 {
		return 0, err
	}
	core, err := resolution.GaussianCore(dev, 2)
	if err != nil {
		return 0, err
	}
	lo, hi := 0.0, 2*core.Sigma.Value
	for range 50 {
		m := 0.5 * (lo + hi)
		w, err := width(m)
		if err != nil {
			return 0, err
		}
		if w > 1 {
			lo = m
		} else {
			hi = m
		}
	}
	return 0.5 * (lo + hi), nil
}
