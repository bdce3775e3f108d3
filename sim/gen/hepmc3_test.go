package gen

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"runtime"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// hepmc3Dir holds files written by the HepMC3 C++ library itself
// (testdata/gen/hepmc3/writer.cc, regen.sh) and the values the writer
// program defined, in GeV and mm, in expected.json.
const hepmc3Dir = "../../testdata/gen/hepmc3/"

// libParticle and libVertex mirror expected.json (GeV, mm).
type libParticle struct {
	PDG    int     `json:"pdg"`
	Status int     `json:"status"`
	Px     float64 `json:"px"`
	Py     float64 `json:"py"`
	Pz     float64 `json:"pz"`
	E      float64 `json:"e"`
	M      float64 `json:"m"`
	From   int     `json:"from"`
	To     int     `json:"to"`
}

type libVertex struct {
	Status int     `json:"status"`
	Placed bool    `json:"placed"`
	X      float64 `json:"x"`
	Y      float64 `json:"y"`
	Z      float64 `json:"z"`
	CT     float64 `json:"ct"`
}

type libEv struct {
	Number    int           `json:"number"`
	Process   int           `json:"process"`
	Weight    float64       `json:"weight"`
	Lab       []float64     `json:"lab"`
	Shift     []float64     `json:"shift"` // of every position, and the event position (E line "@")
	Vertices  []libVertex   `json:"vertices"`
	Particles []libParticle `json:"particles"`
}

func loadExpected(t *testing.T) []libEv {
	t.Helper()
	b, err := os.ReadFile(hepmc3Dir + "expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Events []libEv `json:"events"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Events) == 0 {
		t.Fatal("expected.json has no events")
	}
	return doc.Events
}

// TestHepMCLibraryFiles reads every file the HepMC3 library wrote and
// compares, event for event, the primaries and the truth with the values
// the writer program defined, converted here on their own: 1 GeV = 1000
// MeV, 1 mm = 0.1 cm, t = c t / c; kinetic energy from |p| and the PDG
// mass; an event with a lab position moved so that its primary vertex
// (the first, NuHepMC status 1) lands there.
func TestHepMCLibraryFiles(t *testing.T) {
	evs := loadExpected(t)
	files := []struct {
		name    string
		lab     bool // the format carries NuHepMC's lab position
		weights bool
	}{
		{"nuhepmc_v1_gev_mm.hepmc3", true, true},
		{"nuhepmc_v09_mev_cm.hepmc3", true, true},
		{"nuhepmc_pre09_gev_mm.hepmc3", true, true},
		{"hepmc2_gev_mm.hepmc", false, true},
		{"hepmc2_mev_cm.hepmc", false, true},
		{"hepmc2_noweights_gev_mm.hepmc", false, false},
	}
	for _, f := range files {
		t.Run(f.name, func(t *testing.T) {
			h, err := OpenHepMC(hepmc3Dir+f.name, HepMCOptions{})
			if err != nil {
				t.Fatal(err)
			}
			defer h.Close()
			if h.Len() != len(evs) {
				t.Fatalf("%d events, want %d", h.Len(), len(evs))
			}
			for i, want := range evs {
				ps, info, err := h.Generate(uint64(i), nil, nil)
				if err != nil {
					t.Fatal(err)
				}
				checkLibEvent(t, fmt.Sprintf("%s event %d", f.name, i), want, ps, info, f.lab, f.weights)
			}
		})
	}
}

func checkLibEvent(t *testing.T, where string, want libEv, ps []phys.Particle, info Info, lab, weights bool) {
	t.Helper()
	const gev, mm = 1000.0, 0.1
	// Positions of the vertices (cm, ns): a vertex without a position of
	// its own has that of the vertex its incoming particle comes from, or
	// the event position when that particle is incoming; shift moved them
	// all.
	var evPos [4]float64
	copy(evPos[:], want.Shift)
	vpos := func(k int) (r3.Vector, float64) {
		x := evPos
		for k >= 0 {
			v := want.Vertices[k]
			if v.Placed {
				x = [4]float64{v.X + evPos[0], v.Y + evPos[1], v.Z + evPos[2], v.CT + evPos[3]}
				break
			}
			next := -1
			for _, p := range want.Particles {
				if p.To == k {
					next = p.From
					break
				}
			}
			k = next
		}
		return r3.Vector{X: x[0] * mm, Y: x[1] * mm, Z: x[2] * mm}, x[3] * mm / phys.SpeedOfLight
	}
	lab = lab && len(want.Lab) > 0
	var shift r3.Vector
	if lab {
		p0, _ := vpos(0)
		shift = r3.Vector{X: want.Lab[0] * mm, Y: want.Lab[1] * mm, Z: want.Lab[2] * mm}.Sub(p0)
	}
	closeTo := func(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }
	const tol = 1e-12
	var prims []libParticle
	var nu, target, nucleon, lepton *libParticle
	skipped, skippedNu := 0, 0
	for k := range want.Particles {
		p := &want.Particles[k]
		switch {
		case p.Status == 4 && isNeutrino(p.PDG):
			nu = p
		case p.Status == 11:
			target = p
		case p.Status == 1 && tracked(p.PDG):
			prims = append(prims, *p)
		case p.Status == 1:
			skipped++
			if isNeutrino(p.PDG) {
				skippedNu++
			}
		}
		if p.Status == 1 && (p.PDG == 2212 || p.PDG == 2112) &&
			(nucleon == nil || p.Px*p.Px+p.Py*p.Py+p.Pz*p.Pz > nucleon.Px*nucleon.Px+nucleon.Py*nucleon.Py+nucleon.Pz*nucleon.Pz) {
			nucleon = p
		}
	}
	for k := range want.Particles {
		p := &want.Particles[k]
		if nu != nil && p.Status == 1 && (p.PDG == nu.PDG || abs(p.PDG) == abs(nu.PDG)-1 && p.PDG*nu.PDG > 0) &&
			(lepton == nil || p.E > lepton.E) {
			lepton = p
		}
	}
	if len(ps) != len(prims) {
		t.Fatalf("%s: %d primaries %+v, want %d", where, len(ps), ps, len(prims))
	}
	for k, w := range prims {
		sp, _ := phys.Lookup(w.PDG)
		mom := r3.Vector{X: w.Px * gev, Y: w.Py * gev, Z: w.Pz * gev}
		ekin := math.Sqrt(mom.Norm2()+sp.Mass*sp.Mass) - sp.Mass
		pos, tm := vpos(w.From)
		pos = pos.Add(shift)
		got := ps[k]
		if got.PDG != w.PDG || !closeTo(got.Ekin, ekin, 1e-9) || got.Dir.Sub(mom.Normalize()).Norm() > 1e-12 ||
			got.Pos.Sub(pos).Norm() > tol*math.Max(1, pos.Norm()) || !closeTo(got.Time, tm, tol) {
			t.Errorf("%s primary %d: %+v, want pdg %d ekin %v dir %v pos %v t %v", where, k, got, w.PDG, ekin, mom.Normalize(), pos, tm)
		}
	}
	if info.SourceEvent != want.Number || info.Process != want.Process || info.Skipped != skipped || info.SkippedNeutrinos != skippedNu {
		t.Errorf("%s: number %d, process %d, skipped %d (%d nu); want %d, %d, %d (%d)", where,
			info.SourceEvent, info.Process, info.Skipped, info.SkippedNeutrinos, want.Number, want.Process, skipped, skippedNu)
	}
	if info.HasWeight != weights || weights && !closeTo(info.Weight, want.Weight, tol) {
		t.Errorf("%s: weight %v (given %v), want %v (given %v)", where, info.Weight, info.HasWeight, want.Weight, weights)
	}
	if info.HasLabPos != lab {
		t.Errorf("%s: HasLabPos %v", where, info.HasLabPos)
	}
	if lab {
		lp := r3.Vector{X: want.Lab[0] * mm, Y: want.Lab[1] * mm, Z: want.Lab[2] * mm}
		lt := 0.0
		if len(want.Lab) == 4 {
			lt = want.Lab[3] * 1e9
		}
		if info.LabPos.Sub(lp).Norm() > tol*math.Max(1, lp.Norm()) || !closeTo(info.LabTime, lt, tol) {
			t.Errorf("%s: lab %v %v ns, want %v %v ns", where, info.LabPos, info.LabTime, lp, lt)
		}
	}
	if nu == nil || target == nil || nucleon == nil || lepton == nil {
		// Only the NC event lacks a nucleon (its nucleus recoils).
		if nucleon == nil && info.FinalNucleon.PDG != 0 {
			t.Errorf("%s: nucleon %+v, want none", where, info.FinalNucleon)
		}
	}
	if nu != nil {
		k := r3.Vector{X: nu.Px * gev, Y: nu.Py * gev, Z: nu.Pz * gev}
		if info.Neutrino != nu.PDG || !closeTo(info.NeutrinoEtot, nu.E*gev, tol) || info.NeutrinoDir.Sub(k.Normalize()).Norm() > tol {
			t.Errorf("%s: neutrino %d %v MeV %v, want %d %v MeV %v", where, info.Neutrino, info.NeutrinoEtot, info.NeutrinoDir, nu.PDG, nu.E*gev, k.Normalize())
		}
		if target != nil && info.Target != target.PDG || target == nil && info.Target != 0 {
			t.Errorf("%s: target %d, want %+v", where, info.Target, target)
		}
		if lepton != nil {
			q := k.Sub(r3.Vector{X: lepton.Px * gev, Y: lepton.Py * gev, Z: lepton.Pz * gev})
			de := (nu.E - lepton.E) * gev
			q2 := q.Norm2() - de*de
			if !closeTo(info.Q2, q2, 1e-9) {
				t.Errorf("%s: Q2 %v, want %v", where, info.Q2, q2)
			}
		}
	}
	if nucleon != nil {
		sp, _ := phys.Lookup(nucleon.PDG)
		mom := r3.Vector{X: nucleon.Px * gev, Y: nucleon.Py * gev, Z: nucleon.Pz * gev}
		ekin := math.Sqrt(mom.Norm2()+sp.Mass*sp.Mass) - sp.Mass
		pos, _ := vpos(nucleon.From)
		got := info.FinalNucleon
		if got.PDG != nucleon.PDG || !closeTo(got.Ekin, ekin, 1e-9) || got.Pos.Sub(pos.Add(shift)).Norm() > 1e-9 {
			t.Errorf("%s: nucleon %+v, want pdg %d ekin %v at %v", where, got, nucleon.PDG, ekin, pos.Add(shift))
		}
	}
}

// TestHepMCHugeCounts: counts on E, N, V and P lines far beyond what a
// small file holds are errors, found without memory sized by the count.
func TestHepMCHugeCounts(t *testing.T) {
	good, err := os.ReadFile(hepmcFile)
	if err != nil {
		t.Fatal(err)
	}
	v3, err := os.ReadFile(hepmc3Dir + "nuhepmc_v1_gev_mm.hepmc3")
	if err != nil {
		t.Fatal(err)
	}
	g, g3 := string(good), string(v3)
	const huge = "100000000"
	cases := map[string]struct{ text, want string }{
		"v2 vertices":    {strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -1 "+huge+" 1 2 0 1 1.0", 1), `announces 100000000 vertices`},
		"v2 random":      {strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -1 2 1 2 "+huge+" 1 1.0", 1), `announces 100000000 random states`},
		"v2 weights":     {strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -1 2 1 2 0 "+huge+" 1.0", 1), `announces 100000000 weights`},
		"v2 names":       {strings.Replace(g, `N 1 "0"`, `N `+huge+` "0"`, 1), `announces 100000000 weight names`},
		"v2 outgoing":    {strings.Replace(g, "3.0000000000000000e+02 1.5000000000000000e+01 2 3 0", "3.0000000000000000e+02 1.5000000000000000e+01 2 "+huge+" 0", 1), `announces 99999997 more particles`},
		"v2 flow":        {strings.Replace(g, "4 0 0 -1 0\nP 2", "4 0 0 -1 "+huge+"\nP 2", 1), `announces 100000000 flow entries`},
		"v3 particles":   {strings.Replace(g3, "E 101 1 5", "E 101 1 "+huge, 1), `announces 100000000 particles`},
		"v3 vertices":    {strings.Replace(g3, "E 101 1 5", "E 101 "+huge+" 5", 1), `announces 100000000 vertices`},
		"v3 duplicate P": {strings.Replace(g3, "P 4 -1 2212", "P 3 -1 2212", 1), `particle id 3 already used on line 17`},
		"v2 duplicate P": {strings.Replace(g, "P 4 2212", "P 3 2212", 1), `particle barcode 3 already used on line 9`},
		"v3 duplicate V": {strings.Replace(g3, "V -2 2 [6]", "V -1 2 [6]", 1), `vertex id -1 already used on line 27`},
	}
	var ms runtime.MemStats
	for name, c := range cases {
		h, err := ReadHepMC(strings.NewReader(c.text), "huge.hepmc", HepMCOptions{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		runtime.ReadMemStats(&ms)
		before := ms.TotalAlloc
		var firstErr error
		for i := range h.Len() {
			if _, _, err := h.Generate(uint64(i), nil, nil); err != nil && firstErr == nil {
				firstErr = err
			}
		}
		runtime.ReadMemStats(&ms)
		alloc := ms.TotalAlloc - before
		t.Logf("%s: %v (%d bytes allocated)", name, firstErr, alloc)
		if firstErr == nil || !strings.Contains(firstErr.Error(), c.want) || !strings.Contains(firstErr.Error(), "huge.hepmc line ") {
			t.Errorf("%s: error %v, want %q", name, firstErr, c.want)
		}
		if alloc > hepmcAllocLimit(len(c.text)) {
			t.Errorf("%s: %d bytes allocated for %d bytes of input", name, alloc, len(c.text))
		}
	}
}

// TestHepMCImplicitVertexOfBeam: a particle whose mother is an incoming
// particle comes from that particle's unwritten end vertex, which has no
// position but the event's (the HepMC3 library reads this event, written
// by it with GenEvent::shift_position_by, the same way), even when the
// particle then enters a placed vertex.
func TestHepMCImplicitVertexOfBeam(t *testing.T) {
	text := `HepMC::Version 3.01.02
HepMC::Asciiv3-START_EVENT_LISTING
E 5 2 3 @ 1 2 3 4
U GEV MM
P 1 0 14 0 0 1 1 0 4
P 2 1 22 0 0 1 1 0 1
V -2 0 [2] @ 6 7 8 9
P 3 -2 11 0 0 1 1.0000001305 0.000511 1
HepMC::Asciiv3-END_EVENT_LISTING
`
	h, err := ReadHepMC(strings.NewReader(text), "beam.hepmc3", HepMCOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ps, _, err := h.Generate(0, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(ps) != 2 || ps[0].Pos.Sub(r3.Vector{X: 0.1, Y: 0.2, Z: 0.3}).Norm() > 1e-12 || ps[1].Pos.Sub(r3.Vector{X: 0.6, Y: 0.7, Z: 0.8}).Norm() > 1e-12 {
		t.Errorf("primaries %+v", ps)
	}
}
