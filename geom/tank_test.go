package geom

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"
)

func TestTankValidate(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, tc := range []struct {
		tank Tank
		want string // substring of the error; "" for valid
	}{
		{DemoTank(), ""},
		{LargeTank(), ""},
		{Tank{Radius: 100, Height: 200}, ""},
		{Tank{Radius: 0, Height: 200}, "Tank.Radius = 0 "},
		{Tank{Radius: -3, Height: 200}, "Tank.Radius = -3 "},
		{Tank{Radius: nan, Height: 200}, "Tank.Radius = NaN "},
		{Tank{Radius: inf, Height: 200}, "Tank.Radius = +Inf "},
		{Tank{Radius: 100, Height: 0}, "Tank.Height = 0 "},
		{Tank{Radius: 100, Height: -1}, "Tank.Height = -1 "},
		{Tank{Radius: 100, Height: nan}, "Tank.Height = NaN "},
		{Tank{Radius: 100, Height: inf}, "Tank.Height = +Inf "},
		{Tank{Radius: 100, Height: 200, SensorOffset: -1}, "Tank.SensorOffset = -1 "},
		{Tank{Radius: 100, Height: 200, SensorOffset: nan}, "Tank.SensorOffset = NaN "},
		{Tank{Radius: 100, Height: 200, SensorOffset: inf}, "Tank.SensorOffset = +Inf "},
		{Tank{Radius: 100, Height: 200, SensorOffset: 100}, "Tank.SensorOffset = 100 leaves no volume"},
		{Tank{Radius: 300, Height: 200, SensorOffset: 100}, "Tank.SensorOffset = 100 leaves no volume"},
		{Tank{Radius: 1e308, Height: 200}, "Tank.Radius = 1e+308 exceeds MaxTankSize"},
		{Tank{Radius: 100, Height: 2e6}, "Tank.Height = 2e+06 exceeds MaxTankSize"},
		{Tank{Radius: MaxTankSize, Height: MaxTankSize}, ""},
	} {
		err := tc.tank.Validate()
		checkErr(t, tc.tank.String(), err, tc.want)
	}
}

// A cylinder 40 m across and 40 m tall holds about 50,000 tonnes of water
// (common practice: the usual round figure for a tank of this class).
func TestTankVolumeWaterMass(t *testing.T) {
	// Density of liquid water at 20 C and 0.1 MPa from the IAPWS-95
	// formulation (Wagner and Pruss, J. Phys. Chem. Ref. Data 31 (2002) 387):
	// 998.2 kg/m^3 (value from memory).
	const waterDensity = 998.2 // kg/m^3
	tank := Tank{Radius: 2000, Height: 4000}
	volume := tank.Volume() * 1e-6 // cm^3 -> m^3
	tonnes := volume * waterDensity / 1000
	// Closed form: pi (20 m)^2 (40 m) = 16000 pi m^3 = 50265.5 m^3.
	if want := 16000 * math.Pi; math.Abs(volume-want) > 1e-9*want {
		t.Errorf("Volume = %v m^3, want %v", volume, want)
	}
	// "About 50,000 t" is a figure given to two significant digits, so it
	// stands for [49.5, 50.5) kt: a 1% window. 40x40 m gives 50.18 kt.
	if math.Abs(tonnes-50000) > 0.01*50000 {
		t.Errorf("40 m x 40 m cylinder holds %.0f t of water, want about 50000 t", tonnes)
	}
}

// The sensor surface area is minus the derivative of the enclosed volume
// with respect to the offset: moving every part of the surface inward by do
// removes InnerArea*do of volume. Central difference, error O(do^2).
func TestInnerAreaIsVolumeDerivative(t *testing.T) {
	for _, tank := range []Tank{DemoTank(), LargeTank(), {Radius: 10, Height: 50, SensorOffset: 1}} {
		const do = 1e-3
		lo, hi := tank, tank
		lo.SensorOffset -= do
		hi.SensorOffset += do
		deriv := (lo.InnerVolume() - hi.InnerVolume()) / (2 * do)
		// V(o) = pi (R-o)^2 (H-2o) has V''' = -12 pi, so the central
		// difference is off by |V'''| do^2/6 = 2 pi do^2; rounding in the two
		// volumes adds about eps V/do. Allow 10x both.
		tol := 10*2*math.Pi*do*do + 10*2.3e-16*tank.InnerVolume()/do
		if got := tank.InnerArea(); math.Abs(got-deriv) > tol {
			t.Errorf("%v: InnerArea %v, -dV/doffset %v", tank, got, deriv)
		}
	}
}

func TestContains(t *testing.T) {
	tank := DemoTank() // sensor surface r = 500, h = 520
	for _, tc := range []struct {
		p    r3.Vector
		want bool
	}{
		{r3.Vector{}, true},
		{r3.Vector{X: 500}, true},                 // on the barrel
		{r3.Vector{X: 500.001}, false},            // just outside
		{r3.Vector{Z: 520}, true},                 // on the top cap
		{r3.Vector{Z: -520.001}, false},           // below the bottom cap
		{r3.Vector{X: 300, Y: 400, Z: 520}, true}, // on the rim
		{r3.Vector{X: 530, Z: 0}, false},          // between sensor surface and vessel wall
		{r3.Vector{X: math.NaN()}, false},
	} {
		if got := tank.Contains(tc.p); got != tc.want {
			t.Errorf("Contains(%v) = %v, want %v", tc.p, got, tc.want)
		}
	}
}

// bisectExit finds where the ray p + t u (p inside) leaves the cylinder by
// bisection on the inside test alone, and the part from which constraint is
// active there. It shares nothing with the quadratic in the package.
func bisectExit(p, u r3.Vector, r, h float64) (float64, Surface, bool) {
	inside := func(t float64) bool {
		q := p.Add(u.Mul(t))
		return math.Hypot(q.X, q.Y) <= r && math.Abs(q.Z) <= h
	}
	lo, hi := 0.0, 2*math.Hypot(2*r, 2*h) // no chord is longer than the diagonal
	for range 200 {
		mid := (lo + hi) / 2
		if mid == lo || mid == hi {
			break
		}
		if inside(mid) {
			lo = mid
		} else {
			hi = mid
		}
	}
	e := p.Add(u.Mul(lo))
	br := math.Abs(math.Hypot(e.X, e.Y) - r)
	cr := math.Abs(math.Abs(e.Z) - h)
	s := Barrel
	if cr < br {
		s = Top
		if e.Z < 0 {
			s = Bottom
		}
	}
	// Near the rim both constraints are active and either part is right.
	ambiguous := math.Abs(br-cr) < 1e-7*(r+h)
	return lo, s, ambiguous
}

// outwardNormal is the outward normal of part s at the wall point e.
func outwardNormal(e r3.Vector, s Surface) r3.Vector {
	switch s {
	case Barrel:
		return r3.Vector{X: e.X, Y: e.Y}.Normalize()
	case Top:
		return r3.Vector{Z: 1}
	}
	return r3.Vector{Z: -1}
}

func TestIntersectAgainstBisection(t *testing.T) {
	tank := LargeTank()
	d, err := NewDetector(tank, 50, nil)
	if err != nil {
		t.Fatal(err)
	}
	r, h := tank.SensorRadius(), tank.SensorHalfHeight()
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 100000
	parts := map[Surface]int{}
	for i := range n {
		p := randomInside(rng, r, h)
		u := randomDirection(rng)
		if i%50 == 0 { // some rays parallel to the axis or to the caps
			u = r3.Vector{Z: math.Copysign(1, u.Z)}
			if i%100 == 0 {
				u = r3.Vector{X: u.Z * 0.6, Y: 0.8 * u.Z}
			}
		}
		got, gotS := d.Intersect(p, u)
		want, wantS, ambiguous := bisectExit(p, u, r, h)
		// The crossing is found to within rounding of the inside test, which
		// moves it along the ray by ~eps*size/|u.n|.
		cos := math.Abs(u.Dot(outwardNormal(p.Add(u.Mul(got)), gotS)))
		tol := 1e-9 * (r + h) * (1 + 1/math.Max(cos, 1e-6))
		if math.Abs(got-want) > tol || (gotS != wantS && !ambiguous) {
			t.Fatalf("ray %d from %v along %v: Intersect = %v on %v, bisection %v on %v", i, p, u, got, gotS, want, wantS)
		}
		if tgot, tS := tank.Intersect(p, u); tgot != got || tS != gotS {
			t.Fatalf("Tank.Intersect %v %v differs from Detector.Intersect %v %v", tgot, tS, got, gotS)
		}
		parts[gotS]++
	}
	// Each part is met in proportion to its solid angle; all must be hit.
	if parts[Barrel] == 0 || parts[Top] == 0 || parts[Bottom] == 0 || parts[NoSurface] != 0 {
		t.Errorf("parts met: %v", parts)
	}
}

// A ray from outside that passes through the cylinder leaves it at the far
// crossing; beyond that it never returns.
func TestIntersectFromOutside(t *testing.T) {
	tank := DemoTank()
	r, h := tank.SensorRadius(), tank.SensorHalfHeight()
	rng := rand.New(rand.NewPCG(3, 4))
	for i := range 20000 {
		c := randomInside(rng, r, h)
		u := randomDirection(rng)
		exit, s, _ := bisectExit(c, u, r, h)
		back := 3000 * rng.Float64() // start behind c, usually outside
		got, gotS := tank.Intersect(c.Sub(u.Mul(back)), u)
		cos := math.Abs(u.Dot(outwardNormal(c.Add(u.Mul(exit)), s)))
		tol := 1e-9 * (r + h + back) * (1 + 1/math.Max(cos, 1e-6))
		if math.Abs(got-(back+exit)) > tol || (gotS != s && cos > 1e-3) {
			t.Fatalf("ray %d: Intersect from %v back = %v on %v, want %v on %v", i, back, got, gotS, back+exit, s)
		}
		ahead := exit + 1 + 100*rng.Float64()
		if got, gotS := tank.Intersect(c.Add(u.Mul(ahead)), u); !math.IsInf(got, 1) || gotS != NoSurface {
			t.Fatalf("ray %d past its exit: Intersect = %v, %v, want +Inf, none", i, got, gotS)
		}
	}
}

func TestIntersectSpecialRays(t *testing.T) {
	tank := DemoTank() // r = 500, h = 520
	inf := math.Inf(1)
	x, y, z := r3.Vector{X: 1}, r3.Vector{Y: 1}, r3.Vector{Z: 1}
	diag := r3.Vector{X: 1, Z: 1}.Normalize()
	for _, tc := range []struct {
		name  string
		p, u  r3.Vector
		dist  float64
		part  Surface
		exact bool
	}{
		{"centre up the axis", r3.Vector{}, z, 520, Top, true},
		{"centre down the axis", r3.Vector{}, z.Mul(-1), 520, Bottom, true},
		{"centre along +x", r3.Vector{}, x, 500, Barrel, true},
		{"centre along -y", r3.Vector{}, y.Mul(-1), 500, Barrel, true},
		{"off axis, parallel to it", r3.Vector{X: 499.9, Z: 20}, z, 500, Top, true},
		{"on the barrel, inward", r3.Vector{X: 500}, x.Mul(-1), 1000, Barrel, true},
		{"on the barrel, outward", r3.Vector{X: 500}, x, 0, Barrel, true},
		{"on the barrel, tangent", r3.Vector{X: 500}, y, 0, Barrel, true},
		{"on the barrel, along the axis", r3.Vector{X: 500, Z: -20}, z, 540, Top, true},
		{"on the top, outward", r3.Vector{Z: 520}, z, 0, Top, true},
		{"on the top, inward", r3.Vector{X: 10, Z: 520}, z.Mul(-1), 1040, Bottom, true},
		{"on the top, sideways", r3.Vector{Z: 520}, x, 500, Barrel, true},
		{"rim, diagonal out", r3.Vector{X: 500, Z: 520}, diag, 0, Top, true},
		{"to the rim", r3.Vector{X: -20, Z: 0}, r3.Vector{X: 520, Z: 520}.Normalize(), 520 * math.Sqrt2, Top, false},
		{"a rounding error outside, moving out", r3.Vector{X: 500 * (1 + 1e-15)}, x, 0, Barrel, true},
		{"outside, through the centre", r3.Vector{X: -800}, x, 1300, Barrel, true},
		{"outside, above, down the axis", r3.Vector{Z: 900}, z.Mul(-1), 1420, Bottom, true},
		{"outside, missing", r3.Vector{X: -800, Y: 600}, x, inf, NoSurface, true},
		{"outside, moving away", r3.Vector{X: 800}, x, inf, NoSurface, true},
		{"outside, parallel to the axis", r3.Vector{X: 800}, z, inf, NoSurface, true},
		{"above, horizontal", r3.Vector{Z: 600}, x, inf, NoSurface, true},
		{"zero direction", r3.Vector{}, r3.Vector{}, inf, NoSurface, true},
		{"NaN direction", r3.Vector{}, r3.Vector{X: math.NaN(), Z: 1}, inf, NoSurface, true},
		{"infinite direction", r3.Vector{}, r3.Vector{X: inf}, inf, NoSurface, true},
	} {
		got, part := tank.Intersect(tc.p, tc.u)
		ok := got == tc.dist
		if !tc.exact {
			ok = math.Abs(got-tc.dist) < 1e-9*tc.dist
		}
		// At the rim both caps and barrel are right answers.
		if !ok || (part != tc.part && !(tc.name == "to the rim" && part == Barrel)) {
			t.Errorf("%s: Intersect(%v, %v) = %v, %v; want %v, %v", tc.name, tc.p, tc.u, got, part, tc.dist, tc.part)
		}
	}
}

func TestDistanceAlong(t *testing.T) {
	tank := DemoTank()
	if got := tank.DistanceAlong(r3.Vector{}, r3.Vector{X: 7}); got != 500 {
		t.Errorf("DistanceAlong with |u| = 7: %v, want 500", got)
	}
	if got := tank.DistanceAlong(r3.Vector{}, r3.Vector{}); !math.IsNaN(got) {
		t.Errorf("DistanceAlong with u = 0: %v, want NaN", got)
	}
	if got := tank.DistanceAlong(r3.Vector{}, r3.Vector{Z: math.Inf(-1)}); !math.IsNaN(got) {
		t.Errorf("DistanceAlong with u = -Inf z: %v, want NaN", got)
	}
}

// nearestWallDistance finds the distance from p to the sensor surface as the
// distance to the nearest of the closest points on each part: the barrel
// point straight out from the axis with z clamped to the barrel, and each cap
// point below/above p with (x, y) clamped to the disk.
func nearestWallDistance(p r3.Vector, r, h float64) float64 {
	rho := math.Hypot(p.X, p.Y)
	var ex, ey float64 = r, 0 // direction out from the axis (any, on the axis)
	if rho > 0 {
		ex, ey = r*p.X/rho, r*p.Y/rho
	}
	best := p.Distance(r3.Vector{X: ex, Y: ey, Z: math.Max(-h, math.Min(h, p.Z))})
	scale := 1.0
	if rho > r {
		scale = r / rho
	}
	for _, zc := range []float64{h, -h} {
		best = math.Min(best, p.Distance(r3.Vector{X: p.X * scale, Y: p.Y * scale, Z: zc}))
	}
	return best
}

func TestDistanceToWall(t *testing.T) {
	tank := DemoTank()
	d, err := NewDetector(tank, 20, nil)
	if err != nil {
		t.Fatal(err)
	}
	r, h := tank.SensorRadius(), tank.SensorHalfHeight()
	rng := rand.New(rand.NewPCG(5, 6))
	for i := range 20000 {
		// Points in a box reaching 300 cm beyond the sensor surface.
		p := r3.Vector{X: (2*rng.Float64() - 1) * (r + 300), Y: (2*rng.Float64() - 1) * (r + 300), Z: (2*rng.Float64() - 1) * (h + 300)}
		want := nearestWallDistance(p, r, h)
		if !tank.Contains(p) {
			want = -want
		}
		if got := d.DistanceToWall(p); math.Abs(got-want) > 1e-9*(r+h) {
			t.Fatalf("point %d %v: DistanceToWall = %v, want %v", i, p, got, want)
		}
	}
	if got := d.DistanceToWall(r3.Vector{}); got != 500 {
		t.Errorf("DistanceToWall(centre) = %v, want 500", got)
	}
}

func TestSurfaceString(t *testing.T) {
	for s, want := range map[Surface]string{NoSurface: "none", Barrel: "barrel", Top: "top", Bottom: "bottom", 9: "Surface(9)"} {
		if got := s.String(); got != want {
			t.Errorf("Surface(%d).String() = %q, want %q", int(s), got, want)
		}
	}
}
