package lowenergy_test

import (
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"sync"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
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
// sensor's dark rate over [t0-500, t0+1000] ns. As the digitizer does
// (pmt.Digitize), a hit within the integration gate of an earlier hit of
// its sensor adds its charge to that hit.
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
	return gated(hits, m.IntegrationWindow)
}

// gated merges each hit within gate ns after an earlier kept hit of its
// sensor into that hit, keeping the order of the kept hits.
func gated(hits []pmt.Hit, gate float64) []pmt.Hit {
	order := make([]int, len(hits))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return hits[order[a]].Time < hits[order[b]].Time })
	open := map[int]int{} // sensor -> index of its last kept hit
	keep := make([]bool, len(hits))
	for _, i := range order {
		h := hits[i]
		if k, ok := open[h.Sensor]; ok && h.Time-hits[k].Time < gate {
			hits[k].Charge += h.Charge
			continue
		}
		open[h.Sensor] = i
		keep[i] = true
	}
	var out []pmt.Hit
	for i, h := range hits {
		if keep[i] {
			out = append(out, h)
		}
	}
	return out
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
		if r.Status != fit.Converged {
			t.Fatalf("synthetic event not converged: %v %s", r.Status, r.Reason)
		}
		// Compare the maximum of the likelihood, before the track-start shift.
		d := r.Track.Vertex.Add(r.Track.Dir.Mul(r.Shift)).Sub(p.Pos)
		// Synthetic hits have no shared event-to-event spread: compare
		// with the statistical covariance of the light point, Cov.
		for _, c := range [][3]float64{{d.X, math.Sqrt(r.Cov[0][0]), r.VertexCRB.X}, {d.Y, math.Sqrt(r.Cov[1][1]), r.VertexCRB.Y}, {d.Z, math.Sqrt(r.Cov[2][2]), r.VertexCRB.Z}} {
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
	// Eight hits inside the selection window on four sensors, each
	// sensor's two hits one integration gate apart.
	var fourSensors []pmt.Hit
	for s := 17; s < 21; s++ {
		fourSensors = append(fourSensors, pmt.Hit{Sensor: s, Time: float64(s - 17), Charge: 1},
			pmt.Hit{Sensor: s, Time: float64(s-17) + cfg.Sensor.IntegrationWindow, Charge: 1})
	}
	twice := append(append([]pmt.Hit(nil), good...), good[7])
	withBad := func(i int, h pmt.Hit) []pmt.Hit {
		c := append([]pmt.Hit(nil), good...)
		c[i] = h
		return c
	}
	cases := []struct {
		name   string
		hits   []pmt.Hit
		status fit.Status
		errSub string
	}{
		{"no hits", nil, fit.NoHits, ""},
		// Four hits are as many as the demo tank's dark noise puts into
		// a selection window with a probability above darkFalseRate.
		{"four hits", good[:4], fit.NoEvent, ""},
		{"four sensors", fourSensors, fit.TooFewSensors, ""},
		{"zero charge", withBad(2, pmt.Hit{Sensor: 1, Charge: 0}), fit.BadInput, "hits[2].Charge = 0"},
		{"negative charge", withBad(2, pmt.Hit{Sensor: 1, Charge: -1}), fit.BadInput, "hits[2].Charge = -1"},
		{"hit given twice", twice, fit.BadInput, fmt.Sprintf("hits[7] and hits[%d] are both on sensor %d", len(good), good[7].Sensor)},
		{"NaN time", withBad(3, pmt.Hit{Sensor: 1, Time: math.NaN()}), fit.BadInput, "hits[3].Time = NaN"},
		{"Inf time", withBad(4, pmt.Hit{Sensor: 1, Time: math.Inf(1)}), fit.BadInput, "hits[4].Time = +Inf"},
		{"NaN charge", withBad(5, pmt.Hit{Sensor: 1, Charge: math.NaN()}), fit.BadInput, "hits[5].Charge = NaN"},
		{"sensor -1", withBad(0, pmt.Hit{Sensor: -1}), fit.BadInput, "hits[0].Sensor = -1"},
		{"sensor N", withBad(1, pmt.Hit{Sensor: n}), fit.BadInput, "hits[1].Sensor ="},
	}
	for _, c := range cases {
		r, err := f.Fit(c.hits)
		if r.Status == fit.Converged || r.Status != c.status {
			t.Errorf("%s: status %v converged %v, want %v", c.name, r.Status, r.Status == fit.Converged, c.status)
		}
		if c.errSub != "" && (err == nil || !strings.Contains(err.Error(), c.errSub)) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.errSub)
		}
		if c.errSub == "" && (err != nil || r.Reason == "") {
			t.Errorf("%s: error %v reason %q, want no error and a reason", c.name, err, r.Reason)
		}
		if _, err := f.TimeLogLikelihood(c.hits, r3.Vector{}, 0); err == nil && c.status != fit.TooFewSensors {
			t.Errorf("%s: TimeLogLikelihood accepted the hits", c.name)
		}
	}
	if r, err := f.Fit(good); err != nil || r.Status != fit.Converged {
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
	base := cfg.Setup
	with := func(change func(*lowenergy.Config)) lowenergy.Config {
		c := lowenergy.Config{Setup: base}
		change(&c)
		return c
	}
	cases := []struct {
		name string
		c    lowenergy.Config
		sub  string
	}{
		{"nil detector", with(func(c *lowenergy.Config) { c.Detector = nil }), "Setup.Detector is nil"},
		{"no sensors", with(func(c *lowenergy.Config) { c.Detector = empty }), "no sensors"},
		{"bad sensor", with(func(c *lowenergy.Config) { c.Sensor = badSensor }), "TTS"},
		{"bad liner", with(func(c *lowenergy.Config) { c.Liner.Reflectivity = 2 }), "Liner.Reflectivity = 2"},
		{"dead outside", with(func(c *lowenergy.Config) { c.Dead = []int{3, cfg.Detector.NumSensors()} }), "Setup.Dead[1]"},
		{"dead twice", with(func(c *lowenergy.Config) { c.Dead = []int{3, 3} }), "listed twice"},
		{"bad tables", with(func(c *lowenergy.Config) { c.Tables = badTables }), "Tables.Residual"},
		{"negative iterations", with(func(c *lowenergy.Config) { c.MaxIterations = -1 }), "MaxIterations = -1"},
	}
	for _, c := range cases {
		_, err := lowenergy.New(c.c)
		if err == nil || !strings.Contains(err.Error(), c.sub) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.sub)
		}
	}
}

// A nil Water means pure water at 20 C, as for every user of a Setup: the
// fitter equals one given that water explicitly.
func TestDefaultWater(t *testing.T) {
	cfg, f := demoFitter(t)
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	s := cfg.Setup
	s.Water = nil
	fNil, err := lowenergy.New(lowenergy.Config{Setup: s})
	if err != nil {
		t.Fatalf("nil water: %v", err)
	}
	s.Water = w
	fDef, err := lowenergy.New(lowenergy.Config{Setup: s})
	if err != nil {
		t.Fatal(err)
	}
	if fNil.GroupVelocity() != fDef.GroupVelocity() {
		t.Errorf("nil water: group velocity %v, default water %v", fNil.GroupVelocity(), fDef.GroupVelocity())
	}
	hits := synthetic(rand.New(rand.NewPCG(1, 2)), f, cfg.Detector, cfg.Sensor, r3.Vector{X: 50}, 0, 60)
	a, errA := fNil.Fit(hits)
	b, errB := fDef.Fit(hits)
	if errA != nil || errB != nil || a.Track != b.Track {
		t.Errorf("nil water fit %+v (%v), default water %+v (%v)", a.Track, errA, b.Track, errB)
	}
}

// EkinRange is the span of the energy calibration.
func TestEkinRange(t *testing.T) {
	_, f := demoFitter(t)
	lo, hi := f.EkinRange()
	cal := f.Tables().Energy
	if lo != cal[0].Ekin || hi != cal[len(cal)-1].Ekin || !(lo < hi) {
		t.Errorf("EkinRange = %v, %v; calibration spans %v to %v MeV", lo, hi, cal[0].Ekin, cal[len(cal)-1].Ekin)
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
		if par[i].Track != serial[i].Track || par[i].Errors != serial[i].Errors {
			t.Errorf("event %d: concurrent fit %+v differs from serial %+v", i, par[i].Track, serial[i].Track)
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
	if _, err := lowenergy.ReadTables(strings.NewReader(minimalTables)); err != nil {
		t.Errorf("minimal tables: %v", err)
	}
	bad := []struct{ file, want string }{
		{"bogus 1\n", "unknown keyword"},
		{"residual 2\n0 1 1\n", "ends inside a section"},
		{"tank 1\n", "want 2 fields"},
		{strings.Replace(minimalTables, "0 1 0.5\n", "2 3 0.5\n", 1), "does not continue"},
		{"residual x\n", "bad count"},
		{"residual 10001\n", "bad count"},
		{minimalTables + "energy 1\n20 300 20 3 50\n", `a second "energy"`},
		{strings.Replace(minimalTables, "50\n10", "-50\n10", 1), "non-negative integer"},
		{strings.Replace(minimalTables, "50\n10", "5.5\n10", 1), "non-negative integer"},
		{strings.Replace(minimalTables, "-1 0 0.5\n0 1 0.5", "-1 0 0.5\n0 6000 0.5", 1), "spans 6001 ns"},
	}
	for _, b := range bad {
		if _, err := lowenergy.ReadTables(strings.NewReader(b.file)); err == nil || !strings.Contains(err.Error(), b.want) {
			t.Errorf("ReadTables(%q): %v, want an error containing %q", b.file, err, b.want)
		}
	}
	// WriteTables writes only what ReadTables reads back.
	tb, _ := lowenergy.ReadTables(strings.NewReader(minimalTables))
	tb.Name = "two words"
	if err := lowenergy.WriteTables(io.Discard, tb); err == nil || !strings.Contains(err.Error(), "one word") {
		t.Errorf("Name with a space: %v", err)
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

// A Fitter is immutable after New: changing the tables it was given, or
// the copy Tables returns, changes no fit.
func TestTablesCopied(t *testing.T) {
	cfg, f := demoFitter(t)
	tb, err := lowenergy.EmbeddedTables("demo")
	if err != nil {
		t.Fatal(err)
	}
	own, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup, Tables: tb})
	if err != nil {
		t.Fatal(err)
	}
	hits := synthetic(rand.New(rand.NewPCG(3, 9)), f, cfg.Detector, cfg.Sensor, r3.Vector{Z: -80}, 0, 60)
	before, err := own.Fit(hits)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []*lowenergy.Tables{tb, own.Tables()} {
		for i := range c.Energy {
			c.Energy[i].Mean *= 2
		}
		c.Residual[0].Density = 1e6
	}
	after, err := own.Fit(hits)
	if err != nil {
		t.Fatal(err)
	}
	if after.Track != before.Track || after.Errors != before.Errors {
		t.Errorf("fit moved after the tables were changed: %+v, was %+v", after.Track, before.Track)
	}
}
