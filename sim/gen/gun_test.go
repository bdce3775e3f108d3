package gen

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/phys"
)

// TestSpectra compares sampled energies with the exact bin probabilities
// of each spectrum's closed-form CDF (chi-square).
func TestSpectra(t *testing.T) {
	hist, err := HistogramSpectrum([]float64{100, 200, 250, 400, 1000}, []float64{3, 0, 5, 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		s   Spectrum
		cdf func(e float64) float64
	}{
		{UniformEnergy(50, 250), func(e float64) float64 { return (e - 50) / 200 }},
		{PowerLaw(2.7, 100, 1e4), func(e float64) float64 {
			return (math.Pow(100, -1.7) - math.Pow(e, -1.7)) / (math.Pow(100, -1.7) - math.Pow(1e4, -1.7))
		}},
		{PowerLaw(1, 10, 1000), func(e float64) float64 { return math.Log(e/10) / math.Log(100) }},
		{hist, func(e float64) float64 { // piecewise linear through the bin totals 3, 0, 5, 2 of 10
			xs, cs := []float64{100, 200, 250, 400, 1000}, []float64{0, 0.3, 0.3, 0.8, 1}
			for i := 1; i < len(xs); i++ {
				if e <= xs[i] {
					return cs[i-1] + (cs[i]-cs[i-1])*(e-xs[i-1])/(xs[i]-xs[i-1])
				}
			}
			return 1
		}},
	} {
		rng := rand.New(rand.NewPCG(11, 12))
		lo, hi := c.s.Range()
		const nb, n = 40, 20000
		counts := make([]int, nb)
		edge := func(i int) float64 { return lo + (hi-lo)*float64(i)/nb }
		for range n {
			e := c.s.Sample(rng)
			if e < lo || e > hi {
				t.Fatalf("%v gave %g", c.s, e)
			}
			counts[min(int((e-lo)/(hi-lo)*nb), nb-1)]++
		}
		probs := make([]float64, nb)
		for i := range probs {
			probs[i] = c.cdf(edge(i+1)) - c.cdf(edge(i))
		}
		chiSquare(t, c.s.String(), counts, probs)
	}
	if e := FixedEnergy(7).Sample(nil); e != 7 {
		t.Errorf("FixedEnergy(7) gave %g", e)
	}
}

func TestSpectrumValidation(t *testing.T) {
	for _, s := range []Spectrum{{}, FixedEnergy(-1), FixedEnergy(math.NaN()), UniformEnergy(5, 5),
		UniformEnergy(-1, 5), PowerLaw(2, 0, 10), PowerLaw(math.Inf(1), 1, 10), PowerLaw(2, 10, 1)} {
		if s.Validate() == nil {
			t.Errorf("%v validated", s)
		}
	}
	for _, c := range [][2][]float64{
		{{1, 2}, {1, 1}}, {{2, 1}, {1}}, {{1, 2}, {-1}}, {{1, 2}, {0}}, {{1, math.NaN()}, {1}}, {{1, 2}, {math.Inf(1)}},
	} {
		if _, err := HistogramSpectrum(c[0], c[1]); err == nil {
			t.Errorf("HistogramSpectrum(%v, %v) accepted", c[0], c[1])
		}
	}
}

// TestFiducialVertex: every vertex lies at least minWall inside the
// sensor surface (geom.Tank.DistanceToWall), and r^2, phi and z are each
// uniform, as they are for a uniform density in a cylinder (chi-square).
func TestFiducialVertex(t *testing.T) {
	tank := geom.DemoTank()
	const minWall = 150.0
	v := InFiducial(tank, minWall)
	if err := v.Validate(); err != nil {
		t.Fatal(err)
	}
	R, H := tank.SensorRadius()-minWall, tank.SensorHalfHeight()-minWall
	rng := rand.New(rand.NewPCG(13, 14))
	const nb, n = 20, 20000
	cr, cphi, cz := make([]int, nb), make([]int, nb), make([]int, nb)
	for range n {
		p := v.Sample(rng)
		if d := tank.DistanceToWall(p); d < minWall-1e-9 {
			t.Fatalf("vertex %v only %g cm from the wall", p, d)
		}
		r2 := (p.X*p.X + p.Y*p.Y) / (R * R)
		phi := math.Atan2(p.Y, p.X)/(2*math.Pi) + 0.5
		z := (p.Z/H + 1) / 2
		cr[min(int(r2*nb), nb-1)]++
		cphi[min(int(phi*nb), nb-1)]++
		cz[min(int(z*nb), nb-1)]++
	}
	flat := make([]float64, nb)
	for i := range flat {
		flat[i] = 1.0 / nb
	}
	chiSquare(t, "r^2", cr, flat)
	chiSquare(t, "phi", cphi, flat)
	chiSquare(t, "z", cz, flat)
	for _, c := range []VertexDist{InFiducial(tank, -1), InFiducial(tank, 500), InFiducial(geom.Tank{Radius: -3}, 0), AtPoint(r3.Vector{Z: math.NaN()}), {}} {
		if c.Validate() == nil {
			t.Errorf("%v validated", c)
		}
	}
}

// TestDirections: isotropic directions have cos theta uniform in [-1, 1]
// and cones cos theta uniform in [cos alpha, 1] about their axis
// (chi-square), azimuth uniform about a tilted axis.
func TestDirections(t *testing.T) {
	axis := r3.Vector{X: 1, Y: -1, Z: 0.5}
	u := axis.Normalize()
	for _, c := range []struct {
		d      DirDist
		cosMin float64
	}{{Isotropic(), -1}, {InCone(axis, 0.3), math.Cos(0.3)}} {
		d := c.d.normalized()
		if err := d.Validate(); err != nil {
			t.Fatal(err)
		}
		ref := u
		if c.cosMin == -1 {
			ref = r3.Vector{Z: 1}
		}
		e1, _ := phys.Basis(ref)
		rng := rand.New(rand.NewPCG(15, 16))
		const nb, n = 20, 20000
		cc, cp := make([]int, nb), make([]int, nb)
		for range n {
			v := d.Sample(rng)
			if math.Abs(v.Norm()-1) > 1e-12 {
				t.Fatalf("direction %v not unit", v)
			}
			x := (v.Dot(ref) - c.cosMin) / (1 - c.cosMin)
			if x < -1e-12 {
				t.Fatalf("%v: direction %v outside the cone", d, v)
			}
			cc[min(int(x*nb), nb-1)]++
			w := v.Sub(ref.Mul(v.Dot(ref)))
			e2 := ref.Cross(e1)
			phi := math.Atan2(w.Dot(e2), w.Dot(e1))/(2*math.Pi) + 0.5
			cp[min(int(phi*nb), nb-1)]++
		}
		flat := make([]float64, nb)
		for i := range flat {
			flat[i] = 1.0 / nb
		}
		chiSquare(t, d.String()+" cos", cc, flat)
		chiSquare(t, d.String()+" phi", cp, flat)
	}
	for _, d := range []DirDist{{}, Along(r3.Vector{}), InCone(axis, 0), InCone(axis, 4), InCone(r3.Vector{X: math.Inf(1)}, 1)} {
		if d.Validate() == nil {
			t.Errorf("%v validated", d)
		}
	}
}

func TestGun(t *testing.T) {
	cfg := GunConfig{
		Particles: []GunParticle{
			{PDG: phys.MuonMinus, Ekin: UniformEnergy(200, 800), Direction: Along(r3.Vector{Z: 2})},
			{PDG: phys.Gamma, Ekin: FixedEnergy(10), Direction: Isotropic()},
		},
		Vertex: InTank(geom.DemoTank()),
		Time:   5,
	}
	g, err := NewGun(cfg)
	if err != nil {
		t.Fatal(err)
	}
	cfg.Particles[0].PDG = phys.Electron // the gun keeps its own copy
	a, info, err := g.Generate(0, rand.New(rand.NewPCG(1, 2)), nil)
	if err != nil || len(a) != 2 || info != (Info{}) {
		t.Fatalf("%v %v %+v", a, err, info)
	}
	if a[0].PDG != phys.MuonMinus || a[0].Dir != (r3.Vector{Z: 1}) || a[0].Pos != a[1].Pos || a[0].Time != 5 || a[1].Ekin != 10 {
		t.Errorf("primaries %+v", a)
	}
	b, _, _ := g.Generate(99, rand.New(rand.NewPCG(1, 2)), make([]phys.Particle, 5))
	if len(b) != 2 || b[0] != a[0] || b[1] != a[1] {
		t.Errorf("same stream, different primaries: %v vs %v", a, b)
	}
	if s := g.String(); !strings.Contains(s, "mu- UniformEnergy(200, 800) MeV Along(0, 0, 1)") || !strings.Contains(s, "gamma") {
		t.Errorf("String() = %q", s)
	}

	for _, c := range []struct {
		mod  func(*GunConfig)
		want string
	}{
		{func(c *GunConfig) { c.Particles = nil }, "GunConfig.Particles is empty"},
		{func(c *GunConfig) { c.Particles[1].PDG = 2212 }, "GunConfig.Particles[1].PDG = 2212"},
		{func(c *GunConfig) { c.Particles[0].PDG = 12345 }, "GunConfig.Particles[0].PDG = 12345: phys: unknown PDG code"},
		{func(c *GunConfig) { c.Particles[0].Ekin = UniformEnergy(9, 3) }, "GunConfig.Particles[0].Ekin: UniformEnergy(9, 3)"},
		{func(c *GunConfig) { c.Particles[1].Direction = DirDist{} }, "GunConfig.Particles[1].Direction: not set"},
		{func(c *GunConfig) { c.Vertex = VertexDist{} }, "GunConfig.Vertex: not set"},
		{func(c *GunConfig) { c.Time = math.NaN() }, "GunConfig.Time = NaN"},
	} {
		cf := GunConfig{Particles: []GunParticle{
			{PDG: phys.MuonMinus, Ekin: FixedEnergy(1), Direction: Isotropic()},
			{PDG: phys.Gamma, Ekin: FixedEnergy(1), Direction: Isotropic()}}, Vertex: AtPoint(r3.Vector{})}
		c.mod(&cf)
		_, err := NewGun(cf)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("error %v, want one containing %q", err, c.want)
		}
	}
}
