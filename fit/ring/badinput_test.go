package ring

import (
	"math"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

func TestNewBadConfig(t *testing.T) {
	d := demoTank(t)
	good := Config{Setup: d.cfg.Setup}
	for _, c := range []struct {
		name string
		mod  func(*Config)
		want string
	}{
		{"nil detector", func(c *Config) { c.Detector = nil }, "Detector"},
		{"bad sensor", func(c *Config) { c.Sensor.TTS = math.NaN() }, "Sensor"},
		{"bad liner", func(c *Config) { c.Liner.Reflectivity = 2 }, "Liner"},
		{"dead out of range", func(c *Config) { c.Dead = []int{-1} }, "Dead"},
		{"negative evaluations", func(c *Config) { c.MaxEvaluations = -5 }, "MaxEvaluations"},
	} {
		cfg := good
		c.mod(&cfg)
		if _, err := New(cfg); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one naming %s", c.name, err, c.want)
		}
	}
}

// TestBadEvents feeds the fit events it cannot use; each must give an
// error, never a panic, and the status and reason in both results.
func TestBadEvents(t *testing.T) {
	d := demoTank(t)
	w := d.fit
	n := d.fit.det.NumSensors()
	for _, c := range []struct {
		name string
		hits []pmt.Hit
		win  Window
		want string
		st   fit.Status
	}{
		{"no hits", nil, Window{}, "no hits", fit.NoHits},
		{"sensor out of range", []pmt.Hit{{Sensor: n, Time: 1, Charge: 1}}, Window{}, "hits[0].Sensor", fit.BadInput},
		{"NaN time", []pmt.Hit{{Sensor: 1, Time: math.NaN(), Charge: 1}}, Window{}, "hits[0].Time", fit.BadInput},
		{"negative charge", []pmt.Hit{{Sensor: 1, Time: 1, Charge: -1}}, Window{}, "hits[0].Charge", fit.BadInput},
		{"zero charge", []pmt.Hit{{Sensor: 2, Time: 1, Charge: 1}, {Sensor: 1, Time: 1, Charge: 0}}, Window{}, "hits[1].Charge", fit.BadInput},
		{"Inf charge", []pmt.Hit{{Sensor: 1, Time: 1, Charge: math.Inf(1)}}, Window{}, "hits[0].Charge", fit.BadInput},
		{"hit given twice", []pmt.Hit{{Sensor: 1, Time: 1, Charge: 1}, {Sensor: 1, Time: 1, Charge: 1}}, Window{}, "given twice", fit.BadInput},
		{"all outside window", []pmt.Hit{{Sensor: 1, Time: 5000, Charge: 1}}, Window{Lo: 0, Hi: 1000}, "window", fit.NoHits},
		{"reversed window", []pmt.Hit{{Sensor: 1, Time: 5, Charge: 1}}, Window{Lo: 10, Hi: 0}, "Window", fit.BadInput},
	} {
		rec, err := w.Fit(c.hits, c.win)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
		for _, r := range []Result{rec.Electron, rec.Muon} {
			if r.Status != c.st || r.Reason == "" {
				t.Errorf("%s: %v result has status %v, reason %q; want %v with a reason", c.name, r.Hypothesis, r.Status, r.Reason, c.st)
			}
		}
	}
}

// TestBadSeeds: FitFrom and Predict reject a vertex outside the tank and
// energies outside the tables with errors naming the field.
func TestBadSeeds(t *testing.T) {
	d := demoTank(t)
	w := d.fit
	ev := simulate(t, d.sim, 3, phys.MuonMinus, r3.Vector{}, r3.Vector{Z: 1}, 300)
	good := fit.Track{Vertex: r3.Vector{}, Dir: r3.Vector{Z: 1}, Ekin: 300}
	lo, hi := d.fit.EkinRange(Muon)
	for _, c := range []struct {
		name string
		tr   fit.Track
		want string
	}{
		{"outside tank", fit.Track{Vertex: r3.Vector{X: 900}, Dir: good.Dir, Ekin: 300}, "Vertex"},
		{"NaN vertex", fit.Track{Vertex: r3.Vector{X: math.NaN()}, Dir: good.Dir, Ekin: 300}, "vertex"},
		{"zero direction", fit.Track{Vertex: good.Vertex, Ekin: 300}, "Dir"},
		{"energy below tables", fit.Track{Vertex: good.Vertex, Dir: good.Dir, Ekin: lo / 2}, "Ekin"},
		{"energy above tables", fit.Track{Vertex: good.Vertex, Dir: good.Dir, Ekin: hi * 2}, "Ekin"},
	} {
		if _, err := w.FitFrom(ev.Hits, Window{}, Muon, c.tr); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("FitFrom %s: error %v, want one naming %s", c.name, err, c.want)
		}
		if err := w.Predict(Muon, c.tr, nil, nil); err == nil {
			t.Errorf("Predict %s: no error", c.name)
		}
	}
	if _, err := w.FitFrom(ev.Hits, Window{}, Hypothesis(7), good); err == nil {
		t.Error("unknown hypothesis accepted")
	}
}

// TestSaturatedAndDead: clipped charges and dead sensors give a converged,
// finite fit of a clean muon.
func TestSaturatedAndDead(t *testing.T) {
	d := demoTank(t)
	ev := simulate(t, d.sim, 4, phys.MuonMinus, r3.Vector{X: -100}, r3.Vector{X: 1}, 400)
	sat := d.cfg.Sensor.Saturation
	var dead []int
	hits := append([]pmt.Hit(nil), ev.Hits...)
	for i := range hits {
		if i%5 == 0 {
			hits[i].Charge = sat // clipped at the front end
		}
		if i%7 == 0 {
			dead = append(dead, hits[i].Sensor)
		}
	}
	cfg := Config{Setup: d.cfg.Setup, SkipUncertainties: true}
	cfg.Dead = dead
	f, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	rec, err := f.FitFrom(hits, Window{}, Muon, fit.Track{Vertex: r3.Vector{X: -90}, Dir: r3.Vector{X: 1, Y: 0.05}, Ekin: 400})
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range []float64{rec.NLL, rec.Track.Ekin, rec.Track.Time, rec.Track.Vertex.X, rec.Track.Dir.X} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("fit with saturated and dead sensors holds a non-finite value: %+v", rec)
		}
	}
	if rec.Status != fit.Converged && rec.Reason == "" {
		t.Error("unconverged result without a reason")
	}
}

func TestNeutrinoEnergyErrors(t *testing.T) {
	r := Result{Hypothesis: Muon, Status: fit.NotConverged, Track: fit.Track{Dir: r3.Vector{X: 1}, Ekin: 400}}
	if _, err := NeutrinoEnergy(&r, r3.Vector{X: 1}); err == nil {
		t.Error("unconverged result accepted")
	}
	r.Status = fit.Converged
	if _, err := NeutrinoEnergy(&r, r3.Vector{}); err == nil {
		t.Error("zero beam accepted")
	}
}

// TestNeutrinoEnergyKinematics checks the reconstructed energy against
// two-body kinematics computed here: with E_nu returned for a lepton at
// angle theta, the invariant mass of (k_nu + P - k_l) must be the proton
// mass, P = (m_n - E_b, 0) (energy-momentum conservation, PDG Review,
// Kinematics).
func TestNeutrinoEnergyKinematics(t *testing.T) {
	const eb = phys.OxygenBindingEnergy // MeV
	for _, c := range []struct {
		h    Hypothesis
		ekin float64
		cos  float64
	}{{Muon, 400, 0.9}, {Electron, 600, 0.5}, {Muon, 900, 0.99}} {
		dir := r3.Vector{X: c.cos, Y: math.Sqrt(1 - c.cos*c.cos)}
		r := Result{Hypothesis: c.h, Status: fit.Converged, Track: fit.Track{Dir: dir, Ekin: c.ekin}}
		enu, err := NeutrinoEnergy(&r, r3.Vector{X: 2})
		if err != nil {
			t.Fatal(err)
		}
		m := c.h.Mass()
		el := c.ekin + m
		pl := math.Sqrt(el*el - m*m)
		mi := phys.NeutronMass - eb
		e := enu + mi - el
		px := enu - pl*c.cos
		py := -pl * math.Sqrt(1-c.cos*c.cos)
		mf := math.Sqrt(e*e - px*px - py*py)
		if math.Abs(mf-phys.ProtonMass) > 1e-6*phys.ProtonMass {
			t.Errorf("%v %g MeV cos %g: E_nu %.3f gives final mass %.4f, want %.4f", c.h, c.ekin, c.cos, enu, mf, phys.ProtonMass)
		}
	}
}

// A corrupt table file is an error, not a panic.
func TestDecodeTablesCorrupt(t *testing.T) {
	if _, err := decodeTables([]byte("not a table file")); err == nil {
		t.Error("corrupt table data accepted")
	}
}
