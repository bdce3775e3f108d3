package geom

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"
)

// benchRays are random rays from inside the large tank, drawn once outside
// the timing loop and shared by both benchmarks so they do the same memory
// traffic; only the work on each ray differs.
func benchRays(b *testing.B) (*Detector, []r3.Vector, []r3.Vector) {
	d, err := Layout(LargeTank(), 50, 0.4)
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(11, 12))
	const n = 1 << 14
	ps, us := make([]r3.Vector, n), make([]r3.Vector, n)
	t := d.Tank()
	for i := range ps {
		ps[i] = randomInside(rng, t.SensorRadius(), t.SensorHalfHeight())
		us[i] = randomDirection(rng)
	}
	return d, ps, us
}

// BenchmarkIntersectLookup is the photon hot path: the wall point of a ray
// and the sensor it lands on.
func BenchmarkIntersectLookup(b *testing.B) {
	d, ps, us := benchRays(b)
	mask := len(ps) - 1
	hits := 0
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		p, u := ps[i&mask], us[i&mask]
		dist, s := d.Intersect(p, u)
		if d.SensorAt(p.Add(u.Mul(dist)), s) >= 0 {
			hits++
		}
	}
	b.ReportMetric(float64(hits)/float64(b.N), "hits/op")
}

// BenchmarkRayFloor is the least any ray code must do: the exit distance
// through the barrel and cap planes, with no surface classification, edge
// cases or lookup.
func BenchmarkRayFloor(b *testing.B) {
	d, ps, us := benchRays(b)
	r2, h := d.cyl.r2, d.cyl.h
	mask := len(ps) - 1
	sum := 0.0
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		p, u := ps[i&mask], us[i&mask]
		a := u.X*u.X + u.Y*u.Y
		bb := p.X*u.X + p.Y*u.Y
		c := p.X*p.X + p.Y*p.Y - r2
		t := (math.Sqrt(bb*bb-a*c) - bb) / a
		t = math.Min(t, (math.Copysign(h, u.Z)-p.Z)/u.Z)
		sum += t
	}
	if !(sum > 0) {
		b.Fatal("no distance")
	}
}
