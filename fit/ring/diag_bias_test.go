package ring

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/phys"
)

// TestDiagVertexBias is a diagnostic of the light model, not a regression
// test: it simulates fully contained single tracks at least 200 cm from
// the wall and, at the true direction, compares the likelihood and the
// prediction with the simulated hits. It runs only when
// CONELIGHT_RING_DIAG is set to the number of events:
//
//	CONELIGHT_RING_DIAG=20 GOMAXPROCS=1 go test ./fit/ring -run TestDiagVertexBias -v -timeout 1h
//
// CONELIGHT_RING_DIAG_TANK selects the tank ("large", the default, or
// "demo"), CONELIGHT_RING_DIAG_PDG the particle (13, the default, or 11),
// CONELIGHT_RING_DIAG_P the momentum (MeV/c, default 500) and
// CONELIGHT_RING_DIAG_FIT=1 adds the full fit of every event;
// CONELIGHT_RING_DIAG_MUON, a comma-separated list of noms, nodelta and
// nostraggling, switches multiple scattering, explicit delta rays or
// straggling off in the simulated muons (the tables keep them).
//
// It logs, summed over the events,
//   - the charge and time parts of the negative log likelihood with the
//     vertex moved along the true axis by -60..+60 cm (the time moved by
//     shift/c), at the true energy and with the energy profiled out, and
//     the minimum of each curve (parabola through the lowest three
//     points);
//   - the observed over the predicted charge and hit count in bins of the
//     cone point along the track (the emission point that sees a sensor
//     at the Cherenkov angle), of the cosine of the sensor to the track
//     seen from the vertex, and of the distance from the cone point;
//   - the simulated direct, scattered and reflected photoelectrons
//     against the predicted direct and indirect totals.
//
// It asserts nothing: its numbers are read by a person.
func TestDiagVertexBias(t *testing.T) {
	n := studyEvents(t, "CONELIGHT_RING_DIAG", "the vertex-bias diagnostic")
	var err error
	var cfg sim.Config
	switch tank := os.Getenv("CONELIGHT_RING_DIAG_TANK"); tank {
	case "", "large":
		cfg, err = sim.LargeConfig(11)
	case "demo":
		cfg, err = sim.DemoConfig(11)
	default:
		t.Fatalf("CONELIGHT_RING_DIAG_TANK = %q must be large or demo", tank)
	}
	if err != nil {
		t.Fatal(err)
	}
	cfg.Workers = 1
	if m := os.Getenv("CONELIGHT_RING_DIAG_MUON"); m != "" {
		// switch parts of the muon physics off in the simulated events
		// (not in the tables)
		cfg.Muon = muon.DefaultConfig()
		for _, opt := range strings.Split(m, ",") {
			switch opt {
			case "noms":
				cfg.Muon.NoScattering = true
			case "nodelta":
				cfg.Muon.NoDeltaRays = true
			case "nostraggling":
				cfg.Muon.NoStraggling = true
			default:
				t.Fatalf("CONELIGHT_RING_DIAG_MUON option %q must be noms, nodelta or nostraggling", opt)
			}
		}
	}
	pdg := phys.MuonMinus
	if s := os.Getenv("CONELIGHT_RING_DIAG_PDG"); s != "" {
		if pdg, err = strconv.Atoi(s); err != nil || (pdg != phys.MuonMinus && pdg != phys.Electron) {
			t.Fatalf("CONELIGHT_RING_DIAG_PDG = %q must be 11 or 13", s)
		}
	}
	p := 500.0
	if s := os.Getenv("CONELIGHT_RING_DIAG_P"); s != "" {
		if p, err = strconv.ParseFloat(s, 64); err != nil || !(p > 0) {
			t.Fatalf("CONELIGHT_RING_DIAG_P = %q must be a positive momentum", s)
		}
	}
	s, f := simAndFitter(t, cfg, true)
	d := newBiasDiag(f, pdg)
	doFit := os.Getenv("CONELIGHT_RING_DIAG_FIT") == "1"
	const minWall = 200
	pt := point{fmt.Sprintf("pdg%d-%g", pdg, p), pdg, p}
	for k := 0; k < n; k++ {
		rng := rand.New(rand.NewPCG(4100, uint64(k)))
		var tt trueTrack
		hits := simulateContained(t, s, rng, pt, minWall, 4100, k, nil, &tt)
		if hits == nil {
			t.Logf("event %d: no contained triggered event", k)
			continue
		}
		tr := fit.Track{Vertex: tt.pos, Dir: tt.dir, Ekin: tt.ekin}
		// A second event of the same track, for the simulated split of
		// the photoelectrons by the origin of their light.
		twin, err := s.Event(1<<40+uint64(k), []phys.Particle{{PDG: pdg, Pos: tt.pos, Dir: tt.dir, Ekin: tt.ekin}})
		if err != nil {
			t.Fatal(err)
		}
		d.peDirect += float64(twin.Truth.PEDirect)
		d.peScat += float64(twin.Truth.PEScattered)
		d.peRefl += float64(twin.Truth.PEReflected)
		if err := d.event(hits, tr); err != nil {
			t.Fatalf("event %d: %v", k, err)
		}
		if doFit {
			rec, err := d.w.fitEvent(hits, Window{})
			if err != nil {
				t.Logf("event %d: fit: %v", k, err)
				continue
			}
			r := rec.Electron
			if d.h == Muon {
				r = rec.Muon
			}
			dv := r.Track.Vertex.Sub(tt.pos)
			along := dv.Dot(tt.dir)
			// The likelihood of the truth on the hits the fit used, and
			// where the fit gains on it.
			nllTrue := d.w.nll(d.h, tr)
			d.gain(tr, r.Track)
			d.fitAlong = append(d.fitAlong, along)
			d.fitDist = append(d.fitDist, dv.Norm())
			d.fitE = append(d.fitE, r.Track.Ekin/tt.ekin-1)
			d.fitDNLL = append(d.fitDNLL, r.NLL-nllTrue)
			// The fit started at the truth: the minimum of the model near it.
			rt, err := d.w.fitFrom(hits, Window{}, d.h, tr)
			line := fmt.Sprintf("event %3d: fit vertex %+6.1f cm along, %5.1f cm off axis, angle %4.2f deg, Ekin %+5.1f%%, converged %v, NLL(fit)-NLL(true) %+7.1f",
				k, along, dv.Sub(tt.dir.Mul(along)).Norm(), math.Acos(math.Min(1, r.Track.Dir.Dot(tt.dir)))*180/math.Pi, 100*(r.Track.Ekin/tt.ekin-1), r.Status == fit.Converged, r.NLL-nllTrue)
			if err == nil {
				dt := rt.Track.Vertex.Sub(tt.pos)
				at := dt.Dot(tt.dir)
				d.trueAlong = append(d.trueAlong, at)
				d.trueDist = append(d.trueDist, dt.Norm())
				line += fmt.Sprintf("; from truth: %+6.1f cm along, %5.1f off, angle %4.2f deg, Ekin %+5.1f%%, NLL-NLL(true) %+7.1f, NLL-NLL(fit) %+7.1f",
					at, dt.Sub(tt.dir.Mul(at)).Norm(), math.Acos(math.Min(1, rt.Track.Dir.Dot(tt.dir)))*180/math.Pi, 100*(rt.Track.Ekin/tt.ekin-1), rt.NLL-nllTrue, rt.NLL-r.NLL)
			}
			t.Log(line)
		}
		t.Logf("event %3d: charge-scan min %+6.1f cm, time-scan min %+6.1f cm, total %+6.1f, E-profiled total %+6.1f; sum q/m1 %.0f pe, predicted %.0f (direct %.0f)",
			k, d.lastMin[0], d.lastMin[1], d.lastMin[2], d.lastMin[3], d.lastQ, d.lastMu, d.lastMuD)
	}
	for _, line := range d.report() {
		t.Log(line)
	}
}

// The vertex shifts of the scan (cm along the true direction).
var diagShifts = func() []float64 {
	var s []float64
	for x := -60.0; x <= 60; x += 10 {
		s = append(s, x)
	}
	return s
}()

// biasBins accumulates observed and predicted light in bins of one
// variable.
type biasBins struct {
	name           string
	edges          []float64
	q, mu, muD     []float64 // observed charge / m1, predicted total and direct pe
	hits, pHit     []float64 // observed hits, predicted hit probability sum
	sensors        []float64
	under, overflo string
}

func newBiasBins(name string, edges []float64) *biasBins {
	nb := len(edges) + 1
	return &biasBins{name: name, edges: edges, q: make([]float64, nb), mu: make([]float64, nb), muD: make([]float64, nb),
		hits: make([]float64, nb), pHit: make([]float64, nb), sensors: make([]float64, nb)}
}

func (b *biasBins) bin(x float64) int {
	for i, e := range b.edges {
		if x < e {
			return i
		}
	}
	return len(b.edges)
}

func (b *biasBins) add(x, q, mu, muD, hit, pHit float64) {
	i := b.bin(x)
	b.q[i] += q
	b.mu[i] += mu
	b.muD[i] += muD
	b.hits[i] += hit
	b.pHit[i] += pHit
	b.sensors[i]++
}

func (b *biasBins) lines() []string {
	out := []string{fmt.Sprintf("%s: bin, sensors, observed q/m1, predicted mu (direct), ratio q/mu, hits, predicted hits, ratio", b.name)}
	for i := range b.q {
		lo, hi := "-inf", "+inf"
		if i > 0 {
			lo = strconv.FormatFloat(b.edges[i-1], 'g', 4, 64)
		}
		if i < len(b.edges) {
			hi = strconv.FormatFloat(b.edges[i], 'g', 4, 64)
		}
		out = append(out, fmt.Sprintf("  [%6s,%6s) %7.0f  %9.1f %9.1f (%9.1f)  %6.3f  %7.0f %9.1f  %6.3f",
			lo, hi, b.sensors[i], b.q[i], b.mu[i], b.muD[i], b.q[i]/b.mu[i], b.hits[i], b.pHit[i], b.hits[i]/b.pHit[i]))
	}
	return out
}

// biasDiag is the state of TestDiagVertexBias.
type biasDiag struct {
	f     *Fitter
	w     *workspace
	h     Hypothesis
	nllQ  [2][]float64 // summed charge part of the scan [fixed E, profiled E]
	nllT  [2][]float64 // time part
	cone  *biasBins    // by cone point s (cm)
	cosB  *biasBins    // by cosine to the track from the vertex
	dist  *biasBins    // by distance from the cone point (cm), ring sensors only
	frac  *biasBins    // by cone point over the muon range
	sumQ  float64
	sumMu float64
	sumMD float64
	mins  [4][]float64
	// last event, for the per-event log line
	lastMin                 [4]float64
	lastQ, lastMu, lastMuD  float64
	fitAlong, fitDist, fitE []float64
	fitDNLL, trueAlong      []float64
	trueDist                []float64
	// simulated photoelectrons by origin, from a twin event per track
	peDirect, peScat, peRefl float64
	// NLL(fit) - NLL(true) per sensor bin
	qT, tT, qF, tF    []float64
	gainCone, gainCos *biasBins
}

func newBiasDiag(f *Fitter, pdg int) *biasDiag {
	d := &biasDiag{f: f, w: f.newWorkspace()}
	if pdg == phys.MuonMinus {
		d.h = Muon
	}
	for k := range d.nllQ {
		d.nllQ[k] = make([]float64, len(diagShifts))
		d.nllT[k] = make([]float64, len(diagShifts))
	}
	d.cone = newBiasBins("by cone point s (cm; below 0: outside the outer ring edge)", []float64{0, 25, 50, 75, 100, 125, 150, 175, 200, 250})
	d.frac = newBiasBins("by cone point s / extent of the light", []float64{0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0})
	d.cosB = newBiasBins("by cosine of the sensor to the track seen from the vertex", []float64{-0.5, 0, 0.3, 0.5, 0.6, 0.65, 0.7, 0.75, 0.8, 0.85, 0.9, 0.95})
	d.gainCone = newBiasBins("NLL(fit)-NLL(true) by true cone point s / extent", d.frac.edges)
	d.gainCos = newBiasBins("NLL(fit)-NLL(true) by true cosine from the vertex", d.cosB.edges)
	d.dist = newBiasBins("by distance from the cone point (cm), cone point on the track", []float64{250, 500, 750, 1000, 1500, 2000, 2500, 3000, 3500})
	return d
}

// shifted returns tr with the vertex moved by x along the direction and
// the time by x/c.
func shifted(tr fit.Track, x float64) fit.Track {
	tr.Vertex = tr.Vertex.Add(tr.Dir.Mul(x))
	tr.Time += x / phys.SpeedOfLight
	return tr
}

// parts returns the charge and time parts of nll.
func (d *biasDiag) parts(tr fit.Track) (q, tm float64) {
	all := d.w.nll(d.h, tr)
	tm = d.w.timeShiftNLL(0)
	return all - tm, tm
}

// profiled returns the charge and time parts at the energy that
// minimizes their sum (golden section in log energy within a factor 1.5
// of the true one).
func (d *biasDiag) profiled(tr fit.Track) (q, tm float64) {
	lo, hi := d.f.EkinRange(d.h)
	a, b := math.Log(math.Max(tr.Ekin/1.5, lo)), math.Log(math.Min(tr.Ekin*1.5, hi))
	val := func(le float64) float64 {
		x := tr
		x.Ekin = math.Exp(le)
		q, tm := d.parts(x)
		return q + tm
	}
	const g = 0.6180339887498949
	x1, x2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := val(x1), val(x2)
	for b-a > 1e-3 {
		if f1 < f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - g*(b-a)
			f1 = val(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(b-a)
			f2 = val(x2)
		}
	}
	tr.Ekin = math.Exp(0.5 * (a + b))
	return d.parts(tr)
}

// event adds one event at its true track tr.
func (d *biasDiag) event(hits []pmt.Hit, tr fit.Track) error {
	w, f := d.w, d.f
	if _, _, _, err := w.setEvent(hits, Window{}); err != nil {
		return err
	}
	w.restrict(tr.Time-promptBefore, tr.Time+f.promptAfter())
	// Scans.
	curves := [4][]float64{}
	for k := range curves {
		curves[k] = make([]float64, len(diagShifts))
	}
	for i, x := range diagShifts {
		st := shifted(tr, x)
		if f.det.DistanceToWall(st.Vertex) < 0 {
			return fmt.Errorf("shifted vertex %v outside", st.Vertex)
		}
		q, tm := d.parts(st)
		d.nllQ[0][i] += q
		d.nllT[0][i] += tm
		curves[0][i], curves[1][i], curves[2][i] = q, tm, q+tm
		q, tm = d.profiled(st)
		d.nllQ[1][i] += q
		d.nllT[1][i] += tm
		curves[3][i] = q + tm
	}
	for k := range curves {
		d.lastMin[k] = scanMinimum(diagShifts, curves[k])
		d.mins[k] = append(d.mins[k], d.lastMin[k])
	}
	// Observed against predicted at the true track.
	w.predict(d.h, tr)
	p := &w.prof
	ct := f.charge
	d.lastQ, d.lastMu, d.lastMuD = 0, 0, 0
	for i := 0; i < f.n; i++ {
		if f.dead[i] {
			continue
		}
		mu := w.muD[i] + w.muI[i]
		pHit := -math.Expm1(-ct.nllNone(mu + f.darkGate))
		q, hit := 0.0, 0.0
		if w.hitQ[i] >= 0 {
			q, hit = w.hitQ[i]/ct.m1, 1
		}
		dx := r3.Vector{X: f.px[i], Y: f.py[i], Z: f.pz[i]}.Sub(tr.Vertex)
		z := dx.Dot(tr.Dir)
		d2 := dx.Norm2()
		b := math.Sqrt(math.Max(d2-z*z, 0))
		s := z - b/f.tanCherenkov
		cosV := z / math.Sqrt(d2)
		d.cone.add(s, q, mu, w.muD[i], hit, pHit)
		d.frac.add(s/p.extent, q, mu, w.muD[i], hit, pHit)
		d.cosB.add(cosV, q, mu, w.muD[i], hit, pHit)
		if s >= 0 && s <= p.light90 {
			R := math.Sqrt(math.Max(d2-2*s*z+s*s, 0))
			d.dist.add(R, q, mu, w.muD[i], hit, pHit)
		}
		d.lastQ += q
		d.lastMu += mu
		d.lastMuD += w.muD[i]
	}
	d.sumQ += d.lastQ
	d.sumMu += d.lastMu
	d.sumMD += d.lastMuD
	return nil
}

// sensorNLL fills q and tm with the charge and time terms of every
// sensor for track tr on the loaded hits (0 for dead sensors).
func (d *biasDiag) sensorNLL(tr fit.Track, q, tm []float64) {
	w, f := d.w, d.f
	w.predict(d.h, tr)
	ct := f.charge
	muN := math.Max(f.darkRate*w.window, 1e-9)
	for i := 0; i < f.n; i++ {
		q[i], tm[i] = 0, 0
		if f.dead[i] {
			continue
		}
		mu := w.muD[i] + w.muI[i] + f.darkGate
		if w.hitQ[i] < 0 {
			q[i] = ct.nllNone(mu)
			continue
		}
		q[i] = ct.nllHit(w.hitQ[i], mu)
		tm[i] = w.timeNLL(w.hitT[i]-w.tDir[i], w.sgT[i], w.muD[i], w.muI[i], muN)
	}
}

// gain adds, per bin of the true geometry, the change of the charge and
// time terms from the true track to the fitted one.
func (d *biasDiag) gain(truth, fit fit.Track) {
	f := d.f
	if d.qT == nil {
		d.qT, d.tT = make([]float64, f.n), make([]float64, f.n)
		d.qF, d.tF = make([]float64, f.n), make([]float64, f.n)
	}
	d.sensorNLL(fit, d.qF, d.tF)
	d.sensorNLL(truth, d.qT, d.tT)
	ext := d.w.prof.extent
	for i := 0; i < f.n; i++ {
		dx := r3.Vector{X: f.px[i], Y: f.py[i], Z: f.pz[i]}.Sub(truth.Vertex)
		z := dx.Dot(truth.Dir)
		b := math.Sqrt(math.Max(dx.Norm2()-z*z, 0))
		sc := z - b/f.tanCherenkov
		dq, dt := d.qF[i]-d.qT[i], d.tF[i]-d.tT[i]
		hit := 0.0
		if d.w.hitQ[i] >= 0 {
			hit = 1
		}
		// q: charge term change, mu: time term change, hits: hit count
		d.gainCone.add(sc/ext, dq, dt, 0, hit, 0)
		d.gainCos.add(z/dx.Norm(), dq, dt, 0, hit, 0)
	}
}

// scanMinimum returns the minimum of the parabola through the lowest
// point of y(x) and its neighbours (the end point when it is lowest).
func scanMinimum(x, y []float64) float64 {
	k := 0
	for i := range y {
		if y[i] < y[k] {
			k = i
		}
	}
	if k == 0 || k == len(y)-1 {
		return x[k]
	}
	y0, y1, y2 := y[k-1], y[k], y[k+1]
	den := y0 - 2*y1 + y2
	if den <= 0 {
		return x[k]
	}
	return x[k] + 0.5*(x[k+1]-x[k])*(y0-y2)/den
}

func (d *biasDiag) report() []string {
	var out []string
	names := [2]string{"true energy", "energy profiled"}
	for k := range d.nllQ {
		out = append(out, fmt.Sprintf("summed scan (%s): shift cm, dNLL charge, dNLL time, dNLL total", names[k]))
		q0, t0 := d.nllQ[k][len(diagShifts)/2], d.nllT[k][len(diagShifts)/2]
		tot := make([]float64, len(diagShifts))
		for i, x := range diagShifts {
			tot[i] = d.nllQ[k][i] + d.nllT[k][i]
			out = append(out, fmt.Sprintf("  %+5.0f  %+9.2f  %+9.2f  %+9.2f", x, d.nllQ[k][i]-q0, d.nllT[k][i]-t0, tot[i]-q0-t0))
		}
		out = append(out, fmt.Sprintf("  minimum of the summed scan: charge %+.1f cm, time %+.1f cm, total %+.1f cm",
			scanMinimum(diagShifts, d.nllQ[k]), scanMinimum(diagShifts, d.nllT[k]), scanMinimum(diagShifts, tot)))
	}
	med := func(xs []float64) string {
		if len(xs) == 0 {
			return "n/a"
		}
		return fmt.Sprintf("median %+.1f, mean %+.1f (n %d)", quantile(xs, 0.5), mean(xs), len(xs))
	}
	out = append(out, "per-event scan minima (cm): charge "+med(d.mins[0])+"; time "+med(d.mins[1])+"; total "+med(d.mins[2])+"; E-profiled total "+med(d.mins[3]))
	out = append(out, fmt.Sprintf("summed observed q/m1 %.0f pe, predicted %.0f pe (direct %.0f, indirect %.0f): ratio %.3f",
		d.sumQ, d.sumMu, d.sumMD, d.sumMu-d.sumMD, d.sumQ/d.sumMu))
	out = append(out, fmt.Sprintf("simulated photoelectrons (twin events, no threshold): direct %.0f, scattered %.0f, reflected %.0f; predicted direct %.0f, indirect %.0f",
		d.peDirect, d.peScat, d.peRefl, d.sumMD, d.sumMu-d.sumMD))
	if len(d.fitAlong) > 0 {
		out = append(out, "fit: vertex shift along the track "+med(d.fitAlong)+"; vertex error 68% quantile "+
			fmt.Sprintf("%.1f cm", quantile(d.fitDist, 0.68))+"; Ekin/true-1 "+med(d.fitE)+"; NLL(fit)-NLL(true) "+med(d.fitDNLL))
		out = append(out, "fit from the truth: vertex shift along "+med(d.trueAlong)+fmt.Sprintf("; vertex error 68%% quantile %.1f cm", quantile(d.trueDist, 0.68)))
	}
	for _, b := range []*biasBins{d.cone, d.frac, d.cosB, d.dist} {
		out = append(out, b.lines()...)
	}
	if len(d.fitAlong) > 0 {
		for _, b := range []*biasBins{d.gainCone, d.gainCos} {
			out = append(out, b.name+": bin, sensors, hits, dNLL charge, dNLL time")
			for i := range b.q {
				out = append(out, fmt.Sprintf("  %2d %8.0f %7.0f %+9.2f %+9.2f", i, b.sensors[i], b.hits[i], b.q[i], b.mu[i]))
			}
		}
	}
	return []string{strings.Join(out, "\n")}
}

func mean(xs []float64) float64 {
	var s float64
	for _, x := range xs {
		s += x
	}
	return s / float64(len(xs))
}
