package lowenergy_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"sync"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/optics"
)

// synthetic draws an event from the fitter's own model: n signal hits on
// sensors drawn uniformly, at times t0 + |x - v| / v_g + r with r from the
// residual table smeared by the sensor's TTS, plus dark hits at the
// sensor's dark rate over [t0-500, t0+1000] ns.
func synthetic(rng *rand.Rand, f *lowenergy.Fitter, det *geom.Detector, m pmt.Model, v r3.Vector, t0 float64, n int) []pmt.Hit {
	bins := f.Tables().Residual
	cum := make([]float64, len(bins))
	total := 0.0
	for i, b := range bins {
		total += b.Density * (b.Hi - b.Lo)
		cum[i] = total
	}
	var hits []pmt.Hit
	for range n {
		u := rng.Float64() * total
		k := 0
		for cum[k] < u {
			k++
		}
		r := bins[k].Lo + rng.Float64()*(bins[k].Hi-bins[k].Lo) + m.TTS*rng.NormFloat64()
		s := rng.IntN(det.NumSensors())
		d := det.Sensor(s).Pos.Sub(v).Norm()
		hits = append(hits, pmt.Hit{Sensor: s, Time: t0 + d/f.GroupVelocity() + r, Charge: 1})
	}
	span := 1500.0
	nDark := int(math.Round(float64(det.NumSensors()) * m.DarkRate * span * 1e-9))
	for range nDark {
		hits = append(hits, pmt.Hit{Sensor: rng.IntN(det.NumSensors()), Time: t0 - 500 + rng.Float64()*span, Charge: 1})
	}
	return hits
}

// On events drawn from the likelihood's own density the time fit is
// efficient: the pulls (fit - truth) / uncertainty have unit width and the
// achieved spread meets the Cramer-Rao bound (maximum-likelihood theory:
// the MLE is asymptotically normal with the inverse Fisher information
// as covariance).
func TestSelfConsistency(t *testing.T) {
	cfg, f := demoFitter(t)
	rng := rand.New(rand.NewPCG(3, 4))
	tank := cfg.Detector.Tank()
	var pulls, dev, crb []float64
	const events = 300
	for range events {
		p := electronIn(rng, tank, 100, 10)
		hits := synthetic(rng, f, cfg.Detector, cfg.Sensor, p.Pos, 10, 80)
		r, err := f.Fit(hits)
		if err != nil {
			t.Fatal(err)
		}
		if !r.Converged {
			t.Fatalf("synthetic event not converged: %v %s", r.Status, r.Reason)
		}
		// Compare the maximum of the likelihood, before the track-start shift.
		d := r.Vertex.Add(r.Dir.Mul(r.Shift)).Sub(p.Pos)
		for _, c := range [][3]float64{{d.X, r.VertexErr.X, r.VertexCRB.X}, {d.Y, r.VertexErr.Y, r.VertexCRB.Y}, {d.Z, r.VertexErr.Z, r.VertexCRB.Z}} {
			pulls = append(pulls, c[0]/c[1])
			dev = append(dev, c[0])
			crb = append(crb, c[2])
		}
	}
	n := float64(len(pulls))
	// The width of a normal sample of n has a standard error of
	// sigma/sqrt(2n) (large-sample normal theory); allow 4 of them.
	tol := 4 / math.Sqrt(2*n)
	var p2, d2, c2 float64
	for i := range pulls {
		p2 += pulls[i] * pulls[i]
		d2 += dev[i] * dev[i]
		c2 += crb[i] * crb[i]
	}
	width := math.Sqrt(p2 / n)
	ratio := math.Sqrt(d2 / c2)
	gc, _ := resolution.GaussianCore(pulls, 2)
	q, _ := resolution.Quantile(pulls, 0.99)
	t.Logf("core %v q99 %v", gc.Sigma, q)
	t.Logf("synthetic: pull width %.3f, achieved rms / Cramer-Rao rms %.3f (tolerance %.3f)", width, ratio, tol)
	if math.Abs(width-1) > tol {
		t.Errorf("pull width %.3f, want 1 +- %.3f", width, tol)
	}
	if math.Abs(ratio-1) > tol {
		t.Errorf("achieved / Cramer-Rao %.3f, want 1 +- %.3f", ratio, tol)
	}
}

func TestBadInput(t *testing.T) {
	cfg, f := demoFitter(t)
	n := cfg.Detector.NumSensors()
	good := synthetic(rand.New(rand.NewPCG(5, 6)), f, cfg.Detector, cfg.Sensor, r3.Vector{}, 0, 60)
	oneSensor := make([]pmt.Hit, 20)
	for i := range oneSensor {
		oneSensor[i] = pmt.Hit{Sensor: 17, Time: float64(i), Charge: 1}
	}
	withBad := func(i int, h pmt.Hit) []pmt.Hit {
		c := append([]pmt.Hit(nil), good...)
		c[i] = h
		return c
	}
	cases := []struct {
		name   string
		hits   []pmt.Hit
		status lowenergy.Status
		errSub string
	}{
		{"no hits", nil, lowenergy.NoHits, ""},
		{"four hits", good[:4], lowenergy.TooFewHits, ""},
		{"one sensor", oneSensor, lowenergy.TooFewSensors, ""},
		{"NaN time", withBad(3, pmt.Hit{Sensor: 1, Time: math.NaN()}), lowenergy.BadInput, "hits[3].Time = NaN"},
		{"Inf time", withBad(4, pmt.Hit{Sensor: 1, Time: math.Inf(1)}), lowenergy.BadInput, "hits[4].Time = +Inf"},
		{"NaN charge", withBad(5, pmt.Hit{Sensor: 1, Charge: math.NaN()}), lowenergy.BadInput, "hits[5].Charge = NaN"},
		{"sensor -1", withBad(0, pmt.Hit{Sensor: -1}), lowenergy.BadInput, "hits[0].Sensor = -1"},
		{"sensor N", withBad(1, pmt.Hit{Sensor: n}), lowenergy.BadInput, "hits[1].Sensor ="},
	}
	for _, c := range cases {
		r, err := f.Fit(c.hits)
		if r.Converged || r.Status != c.status {
			t.Errorf("%s: status %v converged %v, want %v", c.name, r.Status, r.Converged, c.status)
		}
		if c.errSub != "" && (err == nil || !strings.Contains(err.Error(), c.errSub)) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.errSub)
		}
		if c.errSub == "" && (err != nil || r.Reason == "") {
			t.Errorf("%s: error %v reason %q, want no error and a reason", c.name, err, r.Reason)
		}
		if _, err := f.TimeLogLikelihood(c.hits, r3.Vector{}, 0); err == nil && c.status != lowenergy.TooFewSensors {
			t.Errorf("%s: TimeLogLikelihood accepted the hits", c.name)
		}
	}
	if r, err := f.Fit(good); err != nil || !r.Converged {
		t.Errorf("good event: %v %v %s", err, r.Status, r.Reason)
	}
}

func TestNewErrors(t *testing.T) {
	cfg, err := sim.DemoConfig(1)
	if err != nil {
		t.Fatal(err)
	}
	empty, err := geom.NewDetector(geom.DemoTank(), cfg.Sensor.CathodeDiameter, nil)
	if err != nil {
		t.Fatal(err)
	}
	badSensor := cfg.Sensor
	badSensor.TTS = math.NaN()
	badTables := &lowenergy.Tables{Name: "x", TankRadius: 1, TankHalfHeight: 1}
	w, _ := optics.NewWater(optics.DefaultWaterConfig())
	cases := []struct {
		name string
		c    lowenergy.Config
		sub  string
	}{
		{"nil detector", lowenergy.Config{Sensor: cfg.Sensor, Water: w}, "Detector is nil"},
		{"no sensors", lowenergy.Config{Detector: empty, Sensor: cfg.Sensor, Water: w}, "no sensors"},
		{"bad sensor", lowenergy.Config{Detector: cfg.Detector, Sensor: badSensor, Water: w}, "TTS"},
		{"nil water", lowenergy.Config{Detector: cfg.Detector, Sensor: cfg.Sensor}, "Water is nil"},
		{"bad tables", lowenergy.Config{Detector: cfg.Detector, Sensor: cfg.Sensor, Water: w, Tables: badTables}, "Tables.Residual"},
		{"negative iterations", lowenergy.Config{Detector: cfg.Detector, Sensor: cfg.Sensor, Water: w, MaxIterations: -1}, "MaxIterations = -1"},
	}
	for _, c := range cases {
		_, err := lowenergy.New(c.c)
		if err == nil || !strings.Contains(err.Error(), c.sub) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.sub)
		}
	}
}

// The fitter is safe for concurrent use: fits from several goroutines
// equal the serial ones, and Fit leaves its input unchanged.
func TestConcurrentFits(t *testing.T) {
	cfg, f := demoFitter(t)
	rng := rand.New(rand.NewPCG(8, 9))
	var events [][]pmt.Hit
	for range 16 {
		p := electronIn(rng, cfg.Detector.Tank(), 100, 10)
		events = append(events, synthetic(rng, f, cfg.Detector, cfg.Sensor, p.Pos, 0, 60))
	}
	serial := make([]lowenergy.Result, len(events))
	for i, h := range events {
		before := append([]pmt.Hit(nil), h...)
		r, err := f.Fit(h)
		if err != nil {
			t.Fatal(err)
		}
		serial[i] = r
		for k := range h {
			if h[k] != before[k] {
				t.Fatalf("Fit modified hit %d", k)
			}
		}
	}
	par := make([]lowenergy.Result, len(events))
	var wg sync.WaitGroup
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := g; i < len(events); i += 4 {
				par[i], _ = f.Fit(events[i])
			}
		}()
	}
	wg.Wait()
	for i := range events {
		if par[i].Vertex != serial[i].Vertex || par[i].Energy != serial[i].Energy || par[i].Dir != serial[i].Dir {
			t.Errorf("event %d: concurrent fit %v differs from serial %v", i, par[i].Vertex, serial[i].Vertex)
		}
	}
}

func TestTablesRoundTrip(t *testing.T) {
	for _, name := range lowenergy.EmbeddedTableNames() {
		tb, err := lowenergy.EmbeddedTables(name)
		if err != nil {
			t.Fatal(err)
		}
		var sb strings.Builder
		if err := lowenergy.WriteTables(&sb, tb); err != nil {
			t.Fatal(err)
		}
		back, err := lowenergy.ReadTables(strings.NewReader(sb.String()))
		if err != nil {
			t.Fatal(err)
		}
		if len(back.Residual) != len(tb.Residual) || len(back.Direction) != len(tb.Direction) || len(back.Energy) != len(tb.Energy) || back.Name != tb.Name {
			t.Errorf("%s: round trip changed the table sizes", name)
		}
		for i := range tb.Energy {
			if back.Energy[i] != tb.Energy[i] {
				t.Errorf("%s: energy point %d: %+v, want %+v", name, i, back.Energy[i], tb.Energy[i])
			}
		}
	}
	if _, err := lowenergy.EmbeddedTables("nope"); err == nil {
		t.Error("unknown table set accepted")
	}
	bad := []string{
		"bogus 1\n",
		"residual 2\n0 1 1\n",
		"tank 1\n",
		"residual 2\n0 1 1\n2 3 1\n",
		"residual x\n",
	}
	for _, b := range bad {
		if _, err := lowenergy.ReadTables(strings.NewReader(b)); err == nil {
			t.Errorf("ReadTables accepted %q", b)
		}
	}
}

func TestLight(t *testing.T) {
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	m := pmt.Medium()
	l, err := lowenergy.NewLight(w, &m, 5000)
	if err != nil {
		t.Fatal(err)
	}
	// The mean group velocity lies within the band's range of c/n_g.
	lo, hi := w.Band()
	vmin, vmax := math.Inf(1), math.Inf(-1)
	for x := lo; x <= hi; x += 1 {
		v := w.GroupVelocity(x)
		vmin, vmax = math.Min(vmin, v), math.Max(vmax, v)
	}
	if !(l.GroupVelocity > vmin && l.GroupVelocity < vmax) {
		t.Errorf("group velocity %v outside [%v, %v]", l.GroupVelocity, vmin, vmax)
	}
	// Transmission: 1 at zero path, decreasing, and bounded below by the
	// transmission at the shortest attenuation length of the band.
	if l.Transmission(0) != 1 {
		t.Errorf("T(0) = %v", l.Transmission(0))
	}
	prev := 1.0
	for d := 100.0; d < 5000; d += 100 {
		tr := l.Transmission(d)
		if !(tr < prev && tr > 0) {
			t.Fatalf("T(%v) = %v not decreasing from %v", d, tr, prev)
		}
		prev = tr
	}
	if _, err := lowenergy.NewLight(nil, &m, 100); err == nil {
		t.Error("nil water accepted")
	}
	if _, err := lowenergy.NewLight(w, &m, math.NaN()); err == nil {
		t.Error("NaN path accepted")
	}
}
