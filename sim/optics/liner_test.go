package optics

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/resolution"
)

func TestSpecularReflect(t *testing.T) {
	n := r3.Vector{X: 0, Y: 0, Z: 1}
	in := r3.Vector{X: 1, Y: 0, Z: -1}.Normalize()
	if out := SpecularReflect(in, n); out.Sub(r3.Vector{X: 1, Y: 0, Z: 1}.Normalize()).Norm() > 1e-15 {
		t.Errorf("specular reflection of %v = %v", in, out)
	}
	// Law of reflection for random geometry: the normal component flips,
	// the tangential one is kept, the result is a unit vector.
	rng := rand.New(rand.NewPCG(5, 6))
	for range 1000 {
		n := randomUnit(rng)
		d := randomUnit(rng)
		if d.Dot(n) > 0 {
			d = d.Mul(-1)
		}
		out := SpecularReflect(d, n)
		tanIn, tanOut := d.Sub(n.Mul(d.Dot(n))), out.Sub(n.Mul(out.Dot(n)))
		if math.Abs(out.Dot(n)+d.Dot(n)) > 1e-14 || tanIn.Sub(tanOut).Norm() > 1e-14 || math.Abs(out.Norm()-1) > 1e-14 {
			t.Fatalf("reflection of %v at %v gave %v", d, n, out)
		}
	}
}

func randomUnit(rng *rand.Rand) r3.Vector {
	return r3.Vector{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}.Normalize()
}

func TestLambertianReflectKS(t *testing.T) {
	// Lambert's law: cos theta about the normal has density 2 cos theta,
	// CDF cos^2 theta; azimuth uniform (mean of the tangential
	// component 0 within 5 sigma: sigma = sqrt(<sin^2 cos^2 phi>/N) = 1/2 /sqrt N).
	rng := rand.New(rand.NewPCG(7, 8))
	n := r3.Vector{X: 0.3, Y: -0.4, Z: 0.5}.Normalize()
	const N = 100000
	cs := make([]float64, N)
	var sum r3.Vector
	for i := range cs {
		v := LambertianReflect(n, rng)
		cs[i] = v.Dot(n)
		sum = sum.Add(v.Sub(n.Mul(cs[i])))
	}
	if d, crit := resolution.KSStatistic(cs, func(c float64) float64 { return c * c }), resolution.KSCritical(N, ksAlpha); d > crit {
		t.Errorf("Lambertian cos: KS D = %g > %g", d, crit)
	}
	if m := sum.Mul(1.0 / N).Norm(); m > 5*0.5/math.Sqrt(N)*math.Sqrt(3) {
		t.Errorf("mean tangential component %g", m)
	}
}

func TestLinerReflect(t *testing.T) {
	l := Liner{Reflectivity: 0.2, DiffuseFraction: 0.25}
	if err := l.Validate(); err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(9, 10))
	n := r3.Vector{X: 0, Y: 0, Z: 1}
	in := r3.Vector{X: 0.6, Y: 0, Z: -0.8}
	spec := SpecularReflect(in, n)
	const N = 200000
	var refl, specular int
	for range N {
		out, ok := l.Reflect(in, n, rng)
		if !ok {
			continue
		}
		refl++
		if out.Dot(n) <= 0 {
			t.Fatalf("reflected direction %v points out of the water", out)
		}
		if out.Sub(spec).Norm() < 1e-15 {
			specular++
		}
	}
	// Binomial counts within 5 sigma.
	within := func(name string, k, trials int, p float64) {
		mean, sd := float64(trials)*p, math.Sqrt(float64(trials)*p*(1-p))
		if math.Abs(float64(k)-mean) > 5*sd {
			t.Errorf("%s: %d of %d, want %g +- %g", name, k, trials, mean, 5*sd)
		}
	}
	within("reflections", refl, N, 0.2)
	within("specular among reflections", specular, refl, 0.75)
	if d := DefaultLiner(); d.Validate() != nil || d.Reflectivity > 0.1 {
		t.Errorf("default liner %+v", d)
	}
	for _, bad := range []Liner{{Reflectivity: -0.1}, {Reflectivity: 1.5}, {Reflectivity: math.NaN()}, {DiffuseFraction: 2}} {
		if err := bad.Validate(); err == nil || !strings.Contains(err.Error(), "Liner.") {
			t.Errorf("Validate(%+v) = %v", bad, err)
		}
	}
}
