package geom

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
)

// Surface names a part of the sensor surface.
type Surface int

// The parts of the sensor surface. The zero value NoSurface means "no part":
// Intersect returns it for a ray that never leaves the sensor cylinder, and
// NewDetector reads it as "work the part out from the position".
const (
	NoSurface Surface = iota
	Barrel            // the curved side, radius Tank.SensorRadius()
	Top               // the flat cap at z = +Tank.SensorHalfHeight()
	Bottom            // the flat cap at z = -Tank.SensorHalfHeight()
)

// String returns the part's name.
func (s Surface) String() string {
	switch s {
	case NoSurface:
		return "none"
	case Barrel:
		return "barrel"
	case Top:
		return "top"
	case Bottom:
		return "bottom"
	}
	return fmt.Sprintf("Surface(%d)", int(s))
}

// Tank is an upright cylindrical water vessel, centre at the origin and axis
// along z. Lengths are in cm.
//
// The sensor (photocathode) surface is the closed cylinder of radius
// Radius-SensorOffset and half height Height/2-SensorOffset: the sensors sit
// SensorOffset inside the vessel wall, leaving room for their bodies and
// support structure.
type Tank struct {
	Radius       float64 // vessel inner radius, cm
	Height       float64 // vessel inner height, cm
	SensorOffset float64 // depth of the sensor surface inside the vessel wall, cm; may be 0
}

// DemoTank returns an invented demonstration tank of about 10 m class:
// vessel radius 560 cm, height 1160 cm, sensors 60 cm inside the wall
// (sensor surface radius 500 cm, height 1040 cm). It describes no real
// detector.
func DemoTank() Tank { return Tank{Radius: 560, Height: 1160, SensorOffset: 60} }

// LargeTank returns an invented reference tank of the 40 m class: vessel
// radius 1940 cm, height 3960 cm, sensor surface 240 cm inside the wall
// (sensor surface radius 1700 cm, height 3480 cm), the space between being
// left for an outer water layer. It describes no real detector.
func LargeTank() Tank { return Tank{Radius: 1940, Height: 3960, SensorOffset: 240} }

// MaxTankSize (cm) bounds a tank's radius and height: ten kilometres, far
// beyond any water-Cherenkov tank, below which areas, volumes and the
// sensor lookup grids keep their precision in float64 (a radius near
// 1e308 would make the area infinite).
const MaxTankSize = 1e6

// Validate reports whether t describes a cylinder with a non-empty sensor
// surface and dimensions up to MaxTankSize. The error names the offending
// field and its value.
func (t Tank) Validate() error {
	if !positiveFinite(t.Radius) {
		return fmt.Errorf("geom: Tank.Radius = %v must be positive and finite", t.Radius)
	}
	if !positiveFinite(t.Height) {
		return fmt.Errorf("geom: Tank.Height = %v must be positive and finite", t.Height)
	}
	if t.Radius > MaxTankSize {
		return fmt.Errorf("geom: Tank.Radius = %v exceeds MaxTankSize %v cm", t.Radius, float64(MaxTankSize))
	}
	if t.Height > MaxTankSize {
		return fmt.Errorf("geom: Tank.Height = %v exceeds MaxTankSize %v cm", t.Height, float64(MaxTankSize))
	}
	if !(t.SensorOffset >= 0) || math.IsInf(t.SensorOffset, 0) {
		return fmt.Errorf("geom: Tank.SensorOffset = %v must be non-negative and finite", t.SensorOffset)
	}
	if t.SensorRadius() <= 0 || t.SensorHalfHeight() <= 0 {
		return fmt.Errorf("geom: Tank.SensorOffset = %v leaves no volume inside the sensor surface (Radius %v, Height %v)",
			t.SensorOffset, t.Radius, t.Height)
	}
	return nil
}

// SensorRadius is the radius of the sensor surface, Radius-SensorOffset (cm).
func (t Tank) SensorRadius() float64 { return t.Radius - t.SensorOffset }

// SensorHalfHeight is the half height of the sensor surface,
// Height/2-SensorOffset (cm).
func (t Tank) SensorHalfHeight() float64 { return t.Height/2 - t.SensorOffset }

// Volume is the inner volume of the vessel, pi Radius^2 Height (cm^3).
func (t Tank) Volume() float64 { return math.Pi * t.Radius * t.Radius * t.Height }

// InnerVolume is the volume enclosed by the sensor surface (cm^3).
func (t Tank) InnerVolume() float64 {
	r := t.SensorRadius()
	return math.Pi * r * r * 2 * t.SensorHalfHeight()
}

// InnerArea is the area of the sensor surface, barrel plus both caps (cm^2).
func (t Tank) InnerArea() float64 { return t.cylinder().area() }

// Contains reports whether p lies inside or on the sensor surface. It
// satisfies the phys.Volume interface.
func (t Tank) Contains(p r3.Vector) bool { return t.cylinder().contains(p) }

// Intersect returns the distance along u from p to the point where the ray
// leaves the sensor cylinder, and the part of the surface it leaves through.
// See Detector.Intersect.
func (t Tank) Intersect(p, u r3.Vector) (float64, Surface) { return t.cylinder().exit(p, u) }

// DistanceToWall returns the distance from p to the nearest point of the
// sensor surface: positive inside, negative outside (cm).
func (t Tank) DistanceToWall(p r3.Vector) float64 { return t.cylinder().signedDistance(p) }

// DistanceAlong returns the distance from p along the direction u (any
// non-zero length) to where the ray leaves the sensor cylinder; +Inf if it
// never does, NaN if u is zero or not finite.
func (t Tank) DistanceAlong(p, u r3.Vector) float64 { return t.cylinder().distanceAlong(p, u) }

// String returns the tank dimensions.
func (t Tank) String() string {
	return fmt.Sprintf("tank radius %g cm, height %g cm, sensor offset %g cm", t.Radius, t.Height, t.SensorOffset)
}

func positiveFinite(x float64) bool { return x > 0 && !math.IsInf(x, 1) }

// cylinder is the sensor surface in the form the ray code wants.
type cylinder struct {
	r, r2, h float64
	// tol is the distance (cm) within which a point outside the surface is
	// taken to lie on it: rounding in p + t*u leaves exit points a few ulps
	// outside, and they must still count as on the wall.
	tol float64
}

func (t Tank) cylinder() cylinder {
	r, h := t.SensorRadius(), t.SensorHalfHeight()
	return cylinder{r: r, r2: r * r, h: h, tol: 1e-9 * (r + h)}
}

func (c cylinder) area() float64 { return 2*math.Pi*c.r*2*c.h + 2*math.Pi*c.r2 }

func (c cylinder) contains(p r3.Vector) bool {
	return p.X*p.X+p.Y*p.Y <= c.r2 && math.Abs(p.Z) <= c.h
}

// exit is the ray-cylinder exit. For p inside it is the unique crossing of
// the surface ahead. For p outside it is the far crossing if the ray passes
// through the cylinder, 0 if p is within tol of the surface and moving out,
// and (+Inf, NoSurface) otherwise.
func (c cylinder) exit(p, u r3.Vector) (float64, Surface) {
	a := u.X*u.X + u.Y*u.Y
	if n2 := a + u.Z*u.Z; !(n2 > 0 && n2 <= 2) {
		return math.Inf(1), NoSurface // u zero, not finite, or far from unit
	}
	b := p.X*u.X + p.Y*u.Y
	q := p.X*p.X + p.Y*p.Y - c.r2
	if q <= 0 && math.Abs(p.Z) <= c.h {
		// Inside: the roots of a t^2 + 2 b t + q = 0 straddle 0; take the
		// larger one in the form that avoids cancellation.
		tb := math.Inf(1)
		if a > 0 {
			s := math.Sqrt(b*b - a*q)
			if b > 0 {
				tb = q / (-b - s)
			} else {
				tb = (s - b) / a
			}
		}
		tc := math.Inf(1)
		capS := NoSurface
		if u.Z > 0 {
			tc, capS = (c.h-p.Z)/u.Z, Top
		} else if u.Z < 0 {
			tc, capS = (-c.h-p.Z)/u.Z, Bottom
		}
		if tb < tc {
			return tb, Barrel
		}
		return tc, capS
	}
	return c.exitOutside(p, u, a, b, q)
}

// exitOutside intersects the slabs in t of the infinite cylinder and of the
// two cap planes.
func (c cylinder) exitOutside(p, u r3.Vector, a, b, q float64) (float64, Surface) {
	enter, leave := math.Inf(-1), math.Inf(1)
	if a > 0 {
		disc := b*b - a*q
		if !(disc >= 0) {
			return math.Inf(1), NoSurface
		}
		s := math.Sqrt(disc)
		if b > 0 {
			enter, leave = (-b-s)/a, q/(-b-s)
		} else {
			enter, leave = q/(s-b), (s-b)/a
		}
	} else if q > 0 {
		return math.Inf(1), NoSurface // parallel to the axis, outside radially
	}
	var capS Surface
	capLeave := math.Inf(1)
	switch {
	case u.Z > 0:
		enter = math.Max(enter, (-c.h-p.Z)/u.Z)
		capLeave, capS = (c.h-p.Z)/u.Z, Top
	case u.Z < 0:
		enter = math.Max(enter, (c.h-p.Z)/u.Z)
		capLeave, capS = (-c.h-p.Z)/u.Z, Bottom
	default:
		if math.Abs(p.Z) > c.h {
			return math.Inf(1), NoSurface
		}
	}
	s := Barrel
	if capLeave <= leave {
		leave, s = capLeave, capS
	}
	// The slack lets a point a rounding error outside, moving out, count as
	// on the wall.
	slack := c.tol / math.Sqrt(a+u.Z*u.Z)
	if !(enter <= leave+slack) || !(leave >= -slack) || math.IsInf(leave, 1) {
		return math.Inf(1), NoSurface
	}
	return math.Max(leave, 0), s
}

func (c cylinder) distanceAlong(p, u r3.Vector) float64 {
	n := u.Norm()
	if !(n > 0) || math.IsInf(n, 1) {
		return math.NaN()
	}
	t, _ := c.exit(p, u.Mul(1/n))
	return t
}

// signedDistance is the signed distance function of the closed cylinder.
func (c cylinder) signedDistance(p r3.Vector) float64 {
	dr := math.Hypot(p.X, p.Y) - c.r
	dz := math.Abs(p.Z) - c.h
	if dr <= 0 && dz <= 0 {
		return -math.Max(dr, dz)
	}
	return -math.Hypot(math.Max(dr, 0), math.Max(dz, 0))
}
