package em

import (
	"bufio"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// readTable reads the numeric rows of a testdata/em file, skipping
// comment lines.
func readTable(t *testing.T, name string) [][]float64 {
	t.Helper()
	f, err := os.Open("../../testdata/em/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][]float64
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		var row []float64
		for _, field := range strings.Fields(line) {
			v, err := strconv.ParseFloat(field, 64)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			row = append(row, v)
		}
		rows = append(rows, row)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return rows
}

func relDiff(got, want float64) float64 { return math.Abs(got/want - 1) }

func TestESTAR(t *testing.T) {
	// NIST ESTAR, liquid water (testdata/em/estar_water.txt, from memory).
	// Collision: the same ICRU 37 formula and I = 75 eV; ESTAR's density
	// effect comes from an oscillator model, ours from the Sternheimer fit
	// (PDG tables), which differ by a few tenths of a percent: 1%.
	// Radiative: ESTAR uses the Seltzer-Berger partial-wave and
	// screened-Born tables, we the high-energy Tsai formula, which is ~5%
	// high at 1 MeV (no Elwert factor, Born approximation): 8% at 1 MeV, 3%
	// above. CSDA range: integral of both, dominated by collision: 1.5%.
	p := newPhysics(t, DefaultConfig())
	for _, row := range readTable(t, "estar_water.txt") {
		e, coll, rad, rng := row[0], row[1], row[2], row[3]
		c, err := p.CollisionStoppingPower(phys.Electron, e)
		if err != nil {
			t.Fatal(err)
		}
		r, _ := p.RadiativeStoppingPower(e)
		R, _ := p.CSDARange(phys.Electron, e)
		radTol := 0.03
		if e < 5 {
			radTol = 0.08
		}
		if d := relDiff(c, coll); d > 0.01 {
			t.Errorf("collision stopping power at %g MeV = %.4f, ESTAR %.4f (%.2f%%)", e, c, coll, 100*d)
		}
		if d := relDiff(r, rad); d > radTol {
			t.Errorf("radiative stopping power at %g MeV = %.5f, ESTAR %.5f (%.2f%%)", e, r, rad, 100*d)
		}
		if d := relDiff(R, rng); d > 0.015 {
			t.Errorf("CSDA range at %g MeV = %.4f, ESTAR %.4f (%.2f%%)", e, R, rng, 100*d)
		}
		t.Logf("T = %g MeV: collision %.4f (ESTAR %.4f), radiative %.5f (%.5f), CSDA %.4f (%.4f)", e, c, coll, r, rad, R, rng)
	}
}

func TestRestrictedMeetsUnrestricted(t *testing.T) {
	// At the largest transfer the Berger-Seltzer restricted bracket, built
	// from the Moller and Bhabha cross-sections, must equal the separately
	// written ICRU Report 37 F-(tau), F+(tau): an algebraic identity that
	// tests the Bhabha coefficients and both closed forms.
	m := material.Water()
	iM2 := math.Pow(m.MeanExcitation/phys.ElectronMass, 2)
	for _, positron := range []bool{false, true} {
		for _, tau := range []float64{0.01, 0.3, 1, 5, 50, 2e3, 1e5} {
			got := restrictedBracket(positron, tau, maxTransfer(positron), iM2, 0.7)
			want := collisionBracket(positron, tau, iM2, 0.7)
			if math.Abs(got-want) > 1e-9*math.Abs(want) {
				t.Errorf("positron=%v tau=%g: restricted at max transfer %.12g, ICRU 37 %.12g", positron, tau, got, want)
			}
		}
	}
}

// integrate is a plain composite Simpson rule, independent of the
// Gauss-Legendre rule of the package.
func integrate(f func(float64) float64, a, b float64, n int) float64 {
	h := (b - a) / float64(n)
	s := f(a) + f(b)
	for i := 1; i < n; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		s += w * f(a+float64(i)*h)
	}
	return s * h / 3
}

func TestRestrictedDerivativeIsCrossSection(t *testing.T) {
	// d(restricted loss)/d(cut) = cut * dsigma/dW at the cut: the
	// restricted formula and the delta-ray cross-section describe the same
	// collisions. In bracket units: d bracket/dx = x * sigma(x), with the
	// Moller sigma carrying 1/beta^2 and Bhabha normalized without it.
	// Also the closed-form total cross-sections against Simpson
	// integration of the differential ones (Moller 1932, Bhabha 1936).
	for _, positron := range []bool{false, true} {
		for _, tau := range []float64{0.8, 4, 40, 400} {
			gamma, beta2 := kinematics(tau)
			diff := func(eps float64) float64 {
				if positron {
					return beta2 * bhabhaDiff(gamma, eps)
				}
				return mollerDiff(gamma, eps)
			}
			for _, x := range []float64{0.01, 0.1, 0.3, 0.45} {
				const h = 1e-6
				d := (restrictedBracket(positron, tau, x+h, 1e-8, 0) - restrictedBracket(positron, tau, x-h, 1e-8, 0)) / (2 * h)
				if want := x * diff(x); math.Abs(d-want) > 1e-5*math.Abs(want) {
					t.Errorf("positron=%v tau=%g x=%g: d bracket/dx = %.8g, x sigma = %.8g", positron, tau, x, d, want)
				}
				got := deltaCrossBracket(positron, tau, x)
				want := integrate(diff, x, maxTransfer(positron), 20000) / beta2
				if relDiff(got, want) > 1e-7 {
					t.Errorf("positron=%v tau=%g x=%g: closed-form cross-section %.10g, integral %.10g", positron, tau, x, got, want)
				}
			}
		}
	}
}

func TestDeltaSampling(t *testing.T) {
	// The sampled knock-on fractions must follow the Moller and Bhabha
	// cross-sections: compare the mean of ln(eps) with its expectation by
	// quadrature, within 5 standard errors of the sample. Also check that
	// the Bhabha acceptance never exceeds its bound 1.
	rng := rand.New(rand.NewPCG(7, 8))
	const n = 40000
	for _, positron := range []bool{false, true} {
		for _, tau := range []float64{1.5, 20, 2000} {
			x := 0.05
			gamma, beta2 := kinematics(tau)
			diff := func(eps float64) float64 {
				if positron {
					return bhabhaDiff(gamma, eps)
				}
				return mollerDiff(gamma, eps)
			}
			hi := maxTransfer(positron)
			norm := integrate(diff, x, hi, 20000)
			mean := integrate(func(e float64) float64 { return math.Log(e) * diff(e) }, x, hi, 20000) / norm
			m2 := integrate(func(e float64) float64 { return math.Log(e) * math.Log(e) * diff(e) }, x, hi, 20000) / norm
			var s float64
			for range n {
				s += math.Log(sampleDeltaFraction(positron, tau, x, rng))
			}
			se := math.Sqrt((m2 - mean*mean) / n)
			if got := s / n; math.Abs(got-mean) > 5*se {
				t.Errorf("positron=%v tau=%g: <ln eps> = %.5f, want %.5f +- %.5f", positron, tau, got, mean, se)
			}
			if positron {
				b1, b2, b3, b4 := bhabhaB(gamma)
				for eps := x; eps <= 1; eps += 0.001 {
					if h := 1 - beta2*eps*(b1-eps*(b2-eps*(b3-eps*b4))); h > 1+1e-12 || h < 0 {
						t.Fatalf("Bhabha acceptance %g outside [0, 1] at tau=%g eps=%g", h, tau, eps)
					}
				}
			}
		}
	}
}

func TestCriticalEnergyAndMoliereRadius(t *testing.T) {
	// PDG atomic and nuclear properties, water (liquid): E_c = 78.33 MeV
	// for e- in Rossi's definition (ionization loss per X0 equal to E),
	// Moliere radius 9.77 g/cm^2 (both from memory). The ICRU 37
	// stopping power and the PDG's differ by the density-effect treatment
	// at the few-tenths-percent level: 1% on E_c, 1.5% on R_M.
	p := newPhysics(t, DefaultConfig())
	if ec := p.CriticalEnergy(); relDiff(ec, 78.33) > 0.01 {
		t.Errorf("critical energy %.2f MeV, PDG 78.33", ec)
	}
	if rm := p.MoliereRadius(); relDiff(rm, 9.77) > 0.015 {
		t.Errorf("Moliere radius %.3f cm, PDG 9.77", rm)
	}
	// E_s = m sqrt(4 pi/alpha) (PDG Review, "Passage of particles through
	// matter") from the phys constants.
	if es := phys.ElectronMass * math.Sqrt(4*math.Pi/phys.FineStructure); relDiff(ScaleEnergy, es) > 1e-5 {
		t.Errorf("ScaleEnergy %g, m sqrt(4 pi/alpha) = %g", ScaleEnergy, es)
	}
}
