package heavy

import (
	"math"
	"sort"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
	"github.com/conelight/conelight/sim/scatter"
)

func TestMeanRangeAndStraggling(t *testing.T) {
	// 1 GeV mu+ stopping in water. Mean path length against the CSDA range
	// (GMS-style total stopping power, integrated independently of the
	// sampling): the restricted mean loss plus the sampled delta rays has
	// the total stopping power as its mean, so the mean path equals the
	// CSDA range up to second order in the fluctuations, (sigma_R/R)^2 ~
	// 1e-4, plus the residual range below the 1 MeV cut (3e-5 of R):
	// tolerance 5 standard errors of the mean plus 0.1%.
	// The spread against first-order range straggling (Bohr variance of
	// the total loss, sigma_R^2 = int Omega'^2(T)/S(T)^3 dT, PDG Review,
	// fluctuations in energy loss): 5 standard errors of a standard
	// deviation (from the sample kurtosis) plus 5% for the first-order
	// formula with the heavy delta-ray tail.
	p := newWater(t, Config{})
	rng := phystest.NewRNG(31, 32)
	const n, ekin = 1500, 1000.0
	var lengths []float64
	for i := 0; i < n; i++ {
		tr, err := p.Track(muonAlongZ(phys.MuonPlus, ekin), ball{R: 1e5}, rng, &countSink{})
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate == phys.DecayedInFlight {
			continue
		}
		if tr.Fate != phys.Stopped {
			t.Fatalf("fate %v", tr.Fate)
		}
		lengths = append(lengths, tr.TrackLength*p.rho)
	}
	m, sd := meanSD(lengths)
	csda, _ := p.CSDARange(ekin)
	if math.Abs(m/csda-1) > 5*sd/math.Sqrt(float64(len(lengths)))/csda+1e-3 {
		t.Errorf("mean path %.2f g/cm2, CSDA range %.2f", m, csda)
	}
	omega2 := func(x float64) float64 {
		k := p.kin(x)
		s, _ := p.StoppingPower(x)
		s *= p.rho
		return p.bohrVariance(k, k.tmax, 1) / (s * s * s)
	}
	wantSD := math.Sqrt(integrateLog(omega2, p.cfg.LowCut, ekin)) * p.rho
	var m4 float64
	for _, v := range lengths {
		m4 += math.Pow(v-m, 4)
	}
	kurt := m4 / float64(len(lengths)) / math.Pow(sd, 4)
	se := sd / 2 * math.Sqrt((kurt-1)/float64(len(lengths)))
	if math.Abs(sd-wantSD) > 5*se+0.05*wantSD {
		t.Errorf("range straggling %.3f g/cm2, first-order Bohr %.3f (se %.3f)", sd, wantSD, se)
	}
}

// projectedWidths returns the rms projected angle (x-z plane) and rms x
// displacement of muons sent along z through a slab of water.
func projectedWidths(t *testing.T, p *Physics, thick float64, n int, seed uint64) (angles, disp []float64) {
	rng := phystest.NewRNG(seed, 33)
	for i := 0; i < n; i++ {
		tr, err := p.Track(muonAlongZ(phys.MuonMinus, 1000), slab{Thick: thick}, rng, &countSink{})
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate != phys.Exited || math.Abs(tr.EndPos.Z-thick) > 1e-6 {
			t.Fatalf("muon did not cross the slab: %+v", tr)
		}
		angles = append(angles, math.Atan2(tr.EndDir.X, tr.EndDir.Z))
		disp = append(disp, tr.EndPos.X)
	}
	return angles, disp
}

func TestHighlandMultipleScatteringOnly(t *testing.T) {
	// Multiple scattering only (no energy loss, test hook), 1 GeV muons
	// through 10 cm of water: the projected angle's rms must be the
	// Highland theta0 of the whole 10 cm, and the displacement's rms
	// x theta0/sqrt(3) (PDG Review, "Passage of particles through
	// matter"), since the step variances add up to the Highland variance
	// of the path, whatever the step (1 cm here). Tolerance 5 standard errors of a Gaussian's rms,
	// 5/sqrt(2n).
	p := newWater(t, Config{MaxStep: 1})
	p.frozen = true
	const n, thick = 20000, 10.0
	angles, disp := projectedWidths(t, p, thick, n, 34)
	k := p.kin(1000)
	theta0 := scatter.Theta0(thick, p.x0, k.p, math.Sqrt(k.beta2), -1)
	tol := 5 / math.Sqrt(2*n)
	if _, sd := meanSD(angles); math.Abs(sd/theta0-1) > tol {
		t.Errorf("rms projected angle %.5f, Highland %.5f", sd, theta0)
	}
	// The displacement: PDG's x theta0/sqrt(3) assumes the angular
	// variance grows linearly along the path; with the Highland log term it
	// grows faster at the end, so the independent expectation is
	// var y = int_0^L 2 (L - l) theta0^2(l) dl (integration by parts of
	// int (L-l)^2 d theta0^2), 2% below the PDG value here. The stepping
	// adds it in 1 cm steps rather than continuously: below 0.5%.
	vy := integrateLog(func(l float64) float64 {
		th := scatter.Theta0(l, p.x0, k.p, math.Sqrt(k.beta2), -1)
		return 2 * (thick - l) * th * th
	}, 1e-6, thick)
	if _, sd := meanSD(disp); math.Abs(sd/math.Sqrt(vy)-1) > tol+0.005 {
		t.Errorf("rms displacement %.5f cm, want %.5f (PDG uniform %.5f)", sd, math.Sqrt(vy), thick*theta0/math.Sqrt(3))
	}
}

func TestHighlandFullTransport(t *testing.T) {
	// The same slab with full transport (energy loss, straggling, delta
	// rays and their recoil). The Highland theta0 is the width of a
	// Gaussian fitted to the central 98% of the projected distribution,
	// accurate to 11% (PDG Review): compare the rms of the central 98%
	// divided by its Gaussian value sqrt(1 - 2 z phi(z)/0.98), z = the
	// 99% quantile, with theta0 at the mean momentum in the slab, within
	// 11% plus 5 statistical standard errors.
	p := newWater(t, Config{})
	const n, thick = 20000, 10.0
	angles, _ := projectedWidths(t, p, thick, n, 35)
	sort.Float64s(angles)
	cut := angles[n/100 : n-n/100]
	_, sd := meanSD(cut)
	z := distuv.UnitNormal.Quantile(0.99)
	sd /= math.Sqrt(1 - 2*z*distuv.UnitNormal.Prob(z)/0.98)
	s, _ := p.StoppingPower(1000)
	k := p.kin(1000 - s*p.rho*thick/2)
	theta0 := scatter.Theta0(thick, p.x0, k.p, math.Sqrt(k.beta2), -1)
	if math.Abs(sd/theta0-1) > 0.11+5/math.Sqrt(2*float64(len(cut))) {
		t.Errorf("central-98%% projected width %.5f, Highland %.5f", sd, theta0)
	}
}

func TestSegments(t *testing.T) {
	// Segments of stopping 1 GeV muons: continuous in space and time, the
	// time of each from the speed (beta linear along the segment, the
	// contract of phys.Segment), all starting above threshold beta = 1/n,
	// and the last ending below it (light stops at threshold). Delta rays
	// are electrons from the track at a segment end.
	p := newWater(t, Config{})
	rng := phystest.NewRNG(41, 42)
	thr := 1 / p.cfg.ThresholdIndex
	for _, pdg := range []int{phys.MuonMinus, phys.MuonPlus} {
		var rec recordSink
		tr, err := p.Track(muonAlongZ(pdg, 1000), ball{R: 1e4}, rng, &rec)
		if err != nil {
			t.Fatal(err)
		}
		if tr.Segments != len(rec.Segs) || len(rec.Segs) < 10 {
			t.Fatalf("%d segments, truth says %d", len(rec.Segs), tr.Segments)
		}
		ends := map[r3.Vector]float64{}
		for i, s := range rec.Segs {
			if s.PDG != pdg || s.Track != 1 || s.Charge != map[int]int{13: -1, -13: 1}[pdg] {
				t.Fatalf("segment %d labels %+v", i, s)
			}
			if s.Beta0 < thr || s.Beta1 > s.Beta0 {
				t.Fatalf("segment %d: beta %g -> %g (threshold %g)", i, s.Beta0, s.Beta1, thr)
			}
			if i > 0 {
				prev := rec.Segs[i-1]
				if prev.End != s.Start || prev.T1 != s.T0 {
					t.Fatalf("segment %d not continuous with %d", i, i-1)
				}
			}
			// The chord exceeds the path length by |disp|^2/(2 s^2) ~
			// theta0^2/6 of the step, below 1e-3 for these steps.
			want := s.Length() / phys.SpeedOfLight * invMeanBeta(s.Beta0, s.Beta1)
			if math.Abs((s.T1-s.T0)/want-1) > 1e-3 {
				t.Fatalf("segment %d: duration %g ns, from speed %g", i, s.T1-s.T0, want)
			}
			ends[s.End] = s.T1
		}
		if last := rec.Segs[len(rec.Segs)-1]; tr.Fate == phys.Stopped && last.Beta1 >= thr {
			t.Errorf("last segment ends at beta %g above threshold %g", last.Beta1, thr)
		}
		lastT := rec.Segs[len(rec.Segs)-1].T1
		for _, d := range rec.Secs {
			// Skip deltas made below threshold (possible between 44 and
			// 51 MeV for a 1 MeV cut).
			if d.Time > lastT {
				continue
			}
			if d.PDG != phys.Electron || d.Parent != 1 {
				t.Fatalf("secondary %+v", d)
			}
			if tt, ok := ends[d.Pos]; !ok || tt != d.Time || d.Ekin < p.cfg.DeltaCut {
				t.Fatalf("delta ray %+v not at a segment end", d)
			}
		}
	}
}

func TestBelowThresholdNoLight(t *testing.T) {
	// A 40 MeV muon is below Cherenkov threshold (beta = 0.67 < 1/1.35):
	// it ranges out (CSDA range from 40 MeV to the 1 MeV cut, within 5%
	// for straggling and scattering detours) and emits no segment.
	p := newWater(t, Config{})
	var sink countSink
	tr, err := p.Track(muonAlongZ(phys.MuonPlus, 40), ball{R: 100}, phystest.NewRNG(43, 44), &sink)
	if err != nil {
		t.Fatal(err)
	}
	r40, _ := p.CSDARange(40)
	r1, _ := p.CSDARange(1)
	if sink.Segments != 0 || tr.Fate != phys.Stopped || math.Abs(tr.TrackLength*p.rho/(r40-r1)-1) > 0.05 {
		t.Errorf("40 MeV muon: %d segments, fate %v, path %g cm (CSDA %g)", sink.Segments, tr.Fate, tr.TrackLength, (r40-r1)/p.rho)
	}
}

func TestEnergyConservation(t *testing.T) {
	// Bookkeeping: initial kinetic energy = deposits + delta rays + kinetic
	// energy on exit, and the sink saw what the truth says.
	p := newWater(t, Config{DeltaCut: 0.3})
	rng := phystest.NewRNG(45, 46)
	for _, c := range []struct {
		ekin, radius float64
	}{{1000, 1e4}, {3000, 300}, {200, 1e4}, {0.5, 10}} {
		var sink countSink
		tr, err := p.Track(muonAlongZ(phys.MuonMinus, c.ekin), ball{R: c.radius}, rng, &sink)
		if err != nil {
			t.Fatal(err)
		}
		sum := tr.Deposited + tr.DeltaEnergy + tr.EndEkin
		if math.Abs(sum-c.ekin) > 1e-9*c.ekin {
			t.Errorf("T=%g: deposits %g + deltas %g + exit %g = %g", c.ekin, tr.Deposited, tr.DeltaEnergy, tr.EndEkin, sum)
		}
		if math.Abs(sink.Deposited-tr.Deposited) > 1e-9*c.ekin ||
			math.Abs(sink.SecondaryEkin-tr.DeltaEnergy) > 1e-9*c.ekin {
			t.Errorf("T=%g: sink totals differ from truth", c.ekin)
		}
	}
}

func TestExit(t *testing.T) {
	// A 1 GeV muon from the centre of a 1 m sphere leaves it: the end
	// point lies on the sphere (bisection to 1e-9 cm), outside side, with
	// about 1 GeV - 100 cm x S left (within 30% of the loss: deltas).
	p := newWater(t, Config{})
	tr, err := p.Track(muonAlongZ(phys.MuonPlus, 1000), ball{R: 100}, phystest.NewRNG(47, 48), &countSink{})
	if err != nil {
		t.Fatal(err)
	}
	if tr.Fate != phys.Exited {
		t.Fatalf("truth %+v", tr)
	}
	if r := tr.EndPos.Norm(); r < 100 || r > 100+1e-6 {
		t.Errorf("exit point at radius %.10g", r)
	}
	s, _ := p.StoppingPower(1000)
	if loss := 1000 - tr.EndEkin; math.Abs(loss/(100*s)-1) > 0.3 {
		t.Errorf("loss %g MeV over 1 m, mean %g", loss, 100*s)
	}
}

func TestDeterministic(t *testing.T) {
	p := newWater(t, Config{})
	a, _ := p.Track(muonAlongZ(phys.MuonMinus, 500), ball{R: 1e4}, phystest.NewRNG(1, 1), &countSink{})
	b, _ := p.Track(muonAlongZ(phys.MuonMinus, 500), ball{R: 1e4}, phystest.NewRNG(1, 1), &countSink{})
	if a != b {
		t.Errorf("same seed, different truth:\n%+v\n%+v", a, b)
	}
}

func TestBadInput(t *testing.T) {
	p := newWater(t, Config{})
	good := muonAlongZ(phys.MuonMinus, 100)
	with := func(f func(*phys.Particle)) phys.Particle { q := good; f(&q); return q }
	for _, c := range []struct {
		part phys.Particle
		want string
	}{
		{with(func(q *phys.Particle) { q.PDG = 11 }), "Particle.PDG = 11"},
		{with(func(q *phys.Particle) { q.Ekin = -1 }), "Particle.Ekin = -1"},
		{with(func(q *phys.Particle) { q.Ekin = math.NaN() }), "Particle.Ekin = NaN"},
		{with(func(q *phys.Particle) { q.Ekin = 2e7 }), "Particle.Ekin = 2e+07"},
		{with(func(q *phys.Particle) { q.Ekin = math.Inf(1) }), "Particle.Ekin = +Inf"},
		{with(func(q *phys.Particle) { q.Dir = r3.Vector{Z: 2} }), "Particle.Dir"},
		{with(func(q *phys.Particle) { q.Dir = r3.Vector{X: math.NaN(), Z: 1} }), "Particle.Dir"},
		{with(func(q *phys.Particle) { q.Pos = r3.Vector{X: 50} }), "Particle.Pos"},
		{with(func(q *phys.Particle) { q.Time = math.NaN() }), "Particle.Time = NaN"},
	} {
		_, err := p.Track(c.part, ball{R: 10}, phystest.NewRNG(1, 2), &countSink{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("Track(%+v): error %v, want it to mention %q", c.part, err, c.want)
		}
	}
	if _, err := p.Track(good, nil, phystest.NewRNG(1, 2), &countSink{}); err == nil {
		t.Error("nil volume accepted")
	}
	if _, err := p.Track(good, ball{R: 10}, nil, &countSink{}); err == nil {
		t.Error("nil rng accepted")
	}
	if _, err := p.Track(good, ball{R: 10}, phystest.NewRNG(1, 2), nil); err == nil {
		t.Error("nil sink accepted")
	}
	for _, c := range []struct {
		cfg  Config
		want string
	}{
		{Config{DeltaCut: -1}, "Config.DeltaCut = -1"},
		{Config{MaxFracLoss: 0.5}, "Config.MaxFracLoss = 0.5"},
		{Config{MaxStep: math.NaN()}, "Config.MaxStep = NaN"},
		{Config{LowCut: 0.5}, "Config.LowCut = 0.5"},
		{Config{ThresholdIndex: 3}, "Config.ThresholdIndex = 3"},
	} {
		if _, err := New(material.Water(), Muon(), c.cfg); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(%+v): error %v, want %q", c.cfg, err, c.want)
		}
	}
	w := material.Water()
	w.Density = 0
	if _, err := New(w, Muon(), Config{}); err == nil || !strings.Contains(err.Error(), "Medium.Density = 0") {
		t.Errorf("zero density: %v", err)
	}
	for _, e := range []float64{0.5, -3, math.NaN(), 1e8} {
		if _, err := p.StoppingPower(e); err == nil || !strings.Contains(err.Error(), "ekin") {
			t.Errorf("StoppingPower(%g): %v", e, err)
		}
		if _, err := p.CSDARange(e); err == nil {
			t.Errorf("CSDARange(%g) accepted", e)
		}
	}
	if _, err := p.RestrictedStoppingPower(100, -1); err == nil || !strings.Contains(err.Error(), "tcut = -1") {
		t.Errorf("negative tcut: %v", err)
	}
}

func TestContinuousSlowingDown(t *testing.T) {
	// With delta rays, straggling and scattering off, the transport is the
	// continuous-slowing-down approximation: the path from T to the low
	// cut is CSDARange(T) - CSDARange(LowCut) (definition of the CSDA
	// range; only table rounding may differ), on a straight line.
	p := newWater(t, Config{NoDeltaRays: true, NoStraggling: true, NoScattering: true})
	for _, ekin := range []float64{30, 1000, 20000} {
		tr, err := p.Track(muonAlongZ(phys.MuonPlus, ekin), ball{R: 1e6}, phystest.NewRNG(61, 62), &countSink{})
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate == phys.DecayedInFlight {
			continue
		}
		r, _ := p.CSDARange(ekin)
		r0, _ := p.CSDARange(p.cfg.LowCut)
		if want := (r - r0) / p.rho; math.Abs(tr.TrackLength/want-1) > 1e-9 || math.Abs(tr.Range/tr.TrackLength-1) > 1e-9 || tr.DeltaRays != 0 {
			t.Errorf("T=%g: path %.9g cm, range %.9g, CSDA %.9g, %d deltas", ekin, tr.TrackLength, tr.Range, want, tr.DeltaRays)
		}
	}
}

func TestDecayLengthInFlight(t *testing.T) {
	// With energy loss off (test hook) a 1 GeV particle keeps beta gamma,
	// so its decay length is exponential with mean beta gamma c tau (PDG
	// mean lives: muon 2196.98 ns, charged pion 26.033 ns; standard error
	// mean/sqrt(n)).
	const n = 4000
	for _, sp := range []Species{Muon(), ChargedPion()} {
		p, err := New(material.Water(), sp, Config{NoScattering: true, MaxStep: 1e4})
		if err != nil {
			t.Fatal(err)
		}
		p.frozen = true
		rng := phystest.NewRNG(27, 28)
		k := p.kin(1000)
		lengths := make([]float64, n)
		for i := range lengths {
			part := muonAlongZ(sp.Positive, 1000)
			tr, err := p.Track(part, ball{R: 1e9}, rng, &countSink{})
			if err != nil {
				t.Fatal(err)
			}
			if tr.Fate != phys.DecayedInFlight {
				t.Fatalf("fate %v", tr.Fate)
			}
			lengths[i] = tr.TrackLength
		}
		want := k.p / sp.Mass * phys.SpeedOfLight * sp.Lifetime
		if m, _ := meanSD(lengths); math.Abs(m/want-1) > 5/math.Sqrt(n) {
			t.Errorf("%s: mean decay length %.4g cm, want %.4g", sp.Name, m, want)
		}
	}
}
