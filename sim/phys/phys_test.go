package phys

import (
	"math"
	"math/rand/v2"
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
