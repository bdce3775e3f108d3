package scatter

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/sim/phys"
)

func TestTheta0Value(t *testing.T) {
	// Independent evaluation of the Highland formula (PDG Review, "Passage
	// of particles through matter"): a 1 GeV/c muon through 10 cm of water
	// (X0 = 36.08 cm, PDG atomic and nuclear properties).
	p := 1000.0
	beta := p / math.Hypot(p, phys.MuonMass)
	x := 10.0
	want := 13.6 / (beta * p) * math.Sqrt(x/36.08) * (1 + 0.038*math.Log(x/(36.08*beta*beta)))
	if got := Theta0(x, 36.08, p, beta, -1); math.Abs(got/want-1) > 1e-12 {
		t.Errorf("Theta0 = %g, want %g", got, want)
	}
}

func TestSampleMoments(t *testing.T) {
	// The sampled projected angle and displacement must have the PDG joint
	// Gaussian moments: rms angle theta0, rms displacement x theta0/sqrt(3),
	// correlation sqrt(3)/2 (PDG Review, "Passage of particles through
	// matter", correlated displacement). Small theta0 so tan(theta) ~ theta.
	rng := rand.New(rand.NewPCG(5, 6))
	u := r3.Vector{X: 0, Y: 0, Z: 1}
	const n = 40000
	const x, th0 = 2.0, 0.01
	ang := make([]float64, n)
	disp := make([]float64, n)
	for i := range ang {
		d, y := Sample(u, x, th0, rng)
		e1, _ := phys.Basis(u)
		ang[i] = math.Atan2(d.Dot(e1), d.Z)
		disp[i] = y.Dot(e1)
	}
	// Relative standard error of a standard deviation is 1/sqrt(2n); allow 5 of them.
	tol := 5 / math.Sqrt(2*n)
	if s := stat.StdDev(ang, nil); math.Abs(s/th0-1) > tol {
		t.Errorf("rms angle %g, want %g", s, th0)
	}
	if s := stat.StdDev(disp, nil); math.Abs(s/(x*th0/math.Sqrt(3))-1) > tol {
		t.Errorf("rms displacement %g, want %g", s, x*th0/math.Sqrt(3))
	}
	// Standard error of a correlation coefficient is (1-r^2)/sqrt(n).
	r := stat.Correlation(ang, disp, nil)
	if want := math.Sqrt(3) / 2; math.Abs(r-want) > 5*(1-want*want)/math.Sqrt(n) {
		t.Errorf("angle-displacement correlation %g, want %g", r, want)
	}
}
