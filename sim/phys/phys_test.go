package phys

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
)

func TestBasisOrthonormal(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	dirs := []r3.Vector{{X: 0, Y: 0, Z: 1}, {X: 0, Y: 0, Z: -1}, {X: 1, Y: 0, Z: 0}}
	for i := 0; i < 1000; i++ {
		dirs = append(dirs, r3.Vector{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}.Normalize())
	}
	for _, u := range dirs {
		e1, e2 := Basis(u)
		const tol = 1e-12
		if math.Abs(e1.Norm()-1) > tol || math.Abs(e2.Norm()-1) > tol ||
			math.Abs(e1.Dot(u)) > tol || math.Abs(e2.Dot(u)) > tol || math.Abs(e1.Dot(e2)) > tol {
			t.Fatalf("basis of %v not orthonormal: %v %v", u, e1, e2)
		}
		if e1.Cross(e2).Sub(u).Norm() > 1e-12 {
			t.Fatalf("basis of %v not right-handed", u)
		}
	}
}

func TestDeflectAngle(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 1000; i++ {
		u := r3.Vector{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}.Normalize()
		c := 2*rng.Float64() - 1
		v := Deflect(u, c, 2*math.Pi*rng.Float64())
		if math.Abs(v.Norm()-1) > 1e-12 || math.Abs(v.Dot(u)-c) > 1e-12 {
			t.Fatalf("Deflect(%v, %g): got %v with cos %g", u, c, v, v.Dot(u))
		}
	}
}

func TestKinematics(t *testing.T) {
	// Independent relations: E^2 = p^2 + m^2 and beta = p/E.
	for _, m := range []float64{ElectronMass, MuonMass} {
		for _, ek := range []float64{0.1, 1, 100, 1e4} {
			p := Momentum(ek, m)
			e := ek + m
			if math.Abs(Beta(ek, m)-p/e) > 1e-12 {
				t.Errorf("beta(%g, %g) = %g, want %g", ek, m, Beta(ek, m), p/e)
			}
			if math.Abs(KineticFromMomentum(p, m)/ek-1) > 1e-9 {
				t.Errorf("round trip kinetic energy %g -> %g", ek, KineticFromMomentum(p, m))
			}
		}
	}
	if _, err := Lookup(99); err == nil {
		t.Error("Lookup(99) gave no error")
	}
	if s, _ := Lookup(MuonMinus); s.Charge != -1 || s.Mass != MuonMass {
		t.Errorf("mu- species = %+v", s)
	}
}

func TestParsePDG(t *testing.T) {
	seen := map[string]int{}
	for _, pdg := range KnownPDG() {
		sp, err := Lookup(pdg)
		if err != nil {
			t.Fatalf("KnownPDG lists %d, which Lookup does not know: %v", pdg, err)
		}
		name := PDGName(pdg)
		if name != sp.Name {
			t.Errorf("PDGName(%d) = %q, Lookup says %q", pdg, name, sp.Name)
		}
		if other, dup := seen[name]; dup {
			t.Errorf("codes %d and %d share the name %q", other, pdg, name)
		}
		seen[name] = pdg
		if got, err := ParsePDG(name); err != nil || got != pdg {
			t.Errorf("ParsePDG(%q) = %d, %v; want %d", name, got, err, pdg)
		}
	}
	// Independent spot checks against the PDG Monte Carlo numbering.
	for name, want := range map[string]int{"e-": 11, "mu+": -13, "gamma": 22, "anti-nu_mu": -14, "p": 2212} {
		if got, err := ParsePDG(name); err != nil || got != want {
			t.Errorf("ParsePDG(%q) = %d, %v; want %d", name, got, err, want)
		}
	}
	for _, bad := range []string{"", "electron", "E-", "mu"} {
		if _, err := ParsePDG(bad); err == nil || !strings.Contains(err.Error(), "mu-") {
			t.Errorf("ParsePDG(%q): error %v should list the known names", bad, err)
		}
	}
	if got := PDGName(0); got != "PDG 0" { // 0 is no particle
		t.Errorf("PDGName(0) = %q", got)
	}
	// KnownPDG lists every code Lookup knows (scanning the codes of
	// elementary particles and hadrons, |code| < 10^4).
	for pdg := -10000; pdg <= 10000; pdg++ {
		if _, err := Lookup(pdg); err == nil && !slices.Contains(KnownPDG(), pdg) {
			t.Errorf("Lookup knows %d, KnownPDG does not list it", pdg)
		}
	}
}
