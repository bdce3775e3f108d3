package geom

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
)

// Sensor is one photosensor: the centre of its photocathode disk on the
// sensor surface and the direction it faces.
type Sensor struct {
	Index   int       // position in Detector.Sensors()
	Pos     r3.Vector // photocathode centre on the sensor surface, cm
	Dir     r3.Vector // facing direction, unit, pointing into the tank
	Surface Surface   // part of the sensor surface the sensor sits on
}

// String returns a one-line description of s.
func (s Sensor) String() string {
	return fmt.Sprintf("sensor %d on %v at (%g, %g, %g) cm facing (%.4g, %.4g, %.4g)",
		s.Index, s.Surface, s.Pos.X, s.Pos.Y, s.Pos.Z, s.Dir.X, s.Dir.Y, s.Dir.Z)
}

// Detector is a tank with its sensors and a lookup index from wall points to
// sensors. A Detector is immutable after construction and safe for
// concurrent use by multiple goroutines.
type Detector struct {
	tank     Tank
	cyl      cylinder
	diameter float64 // photocathode diameter, cm
	rc2      float64 // photocathode radius squared, cm^2
	sensors  []Sensor

	barrel      grid // u = azimuth phi in [-pi, pi], v = z; u periodic
	top, bottom grid // u = x, v = y
}

// positionTolerance is how far (cm) a sensor centre given to NewDetector may
// lie from the sensor surface, and by how much a photocathode may overhang
// the edge of its part or overlap a neighbour: enough to absorb positions
// written to 0.1 mm.
const positionTolerance = 0.01

// NewDetector builds a detector from an explicit sensor list. All sensors
// share the photocathode diameter cathodeDiameter (cm).
//
// Each sensor's Index is set to its position in the slice (the input value
// is ignored). Its Surface is worked out from Pos; a Surface other than
// NoSurface must agree with it. Pos must lie within 0.01 cm of the sensor
// surface, and the photocathode disk (diameter cathodeDiameter, measured
// along the surface) must fit inside its part: on the barrel within
// |z| <= h - D/2, on a cap within the disk of radius r - D/2. Dir must be
// finite, non-zero and point into the tank (positive component along the
// inward normal); it is normalized unless it is already unit to rounding.
// No two photocathodes may overlap (centres closer than D along the
// surface). sensors is not modified; an empty list is allowed.
func NewDetector(t Tank, cathodeDiameter float64, sensors []Sensor) (*Detector, error) {
	d, _, err := newDetector(t, cathodeDiameter, sensors)
	return d, err
}

// newDetector also returns the index of the sensor an error is about, or -1,
// so that the CSV reader can report the line.
func newDetector(t Tank, diameter float64, sensors []Sensor) (*Detector, int, error) {
	if err := t.Validate(); err != nil {
		return nil, -1, err
	}
	if err := checkDiameter(t, diameter); err != nil {
		return nil, -1, err
	}
	d := &Detector{
		tank:     t,
		cyl:      t.cylinder(),
		diameter: diameter,
		rc2:      diameter * diameter / 4,
		sensors:  make([]Sensor, len(sensors)),
	}
	for i, s := range sensors {
		ns, err := d.checkSensor(s)
		if err != nil {
			return nil, i, fmt.Errorf("geom: sensor %d: %w", i, err)
		}
		ns.Index = i
		d.sensors[i] = ns
	}
	d.buildIndex()
	if i, j, dist, ok := d.findOverlap(); ok {
		return nil, j, fmt.Errorf("geom: sensors %d and %d overlap: photocathode centres %.6g cm apart along the surface, less than the cathode diameter %g cm",
			i, j, dist, diameter)
	}
	return d, -1, nil
}

func checkDiameter(t Tank, diameter float64) error {
	if !positiveFinite(diameter) {
		return fmt.Errorf("geom: cathode diameter = %v must be positive and finite", diameter)
	}
	if r, h := t.SensorRadius(), t.SensorHalfHeight(); diameter > 2*r || diameter > 2*h {
		return fmt.Errorf("geom: cathode diameter = %v cm does not fit the sensor surface (radius %g cm, height %g cm)",
			diameter, r, 2*h)
	}
	return nil
}

// checkSensor validates one sensor and returns it with its surface set and
// its direction normalized.
func (d *Detector) checkSensor(s Sensor) (Sensor, error) {
	p := s.Pos
	if !finiteVector(p) {
		return s, fmt.Errorf("Pos = %v must be finite", fmtVector(p))
	}
	c, half := d.cyl, d.diameter/2
	rho := math.Hypot(p.X, p.Y)
	var part Surface
	var inward r3.Vector
	switch {
	case math.Abs(rho-c.r) <= positionTolerance && math.Abs(p.Z) <= c.h-half+positionTolerance:
		part, inward = Barrel, r3.Vector{X: -p.X / rho, Y: -p.Y / rho}
	case math.Abs(p.Z-c.h) <= positionTolerance && rho <= c.r-half+positionTolerance:
		part, inward = Top, r3.Vector{Z: -1}
	case math.Abs(p.Z+c.h) <= positionTolerance && rho <= c.r-half+positionTolerance:
		part, inward = Bottom, r3.Vector{Z: 1}
	default:
		return s, fmt.Errorf("Pos = %v: the photocathode (diameter %g cm) is not on the sensor surface or does not fit inside its part (distance to the surface %.4g cm)",
			fmtVector(p), d.diameter, math.Abs(c.signedDistance(p)))
	}
	if s.Surface != NoSurface && s.Surface != part {
		return s, fmt.Errorf("Surface = %v disagrees with Pos = %v, which is on the %v", s.Surface, fmtVector(p), part)
	}
	s.Surface = part
	n := s.Dir.Norm()
	if !finiteVector(s.Dir) || !(n > 0) {
		return s, fmt.Errorf("Dir = %v must be finite and non-zero", fmtVector(s.Dir))
	}
	// Keep directions that are already unit to rounding bit-for-bit, so
	// that a layout survives a write/read cycle unchanged.
	if math.Abs(n-1) > 4e-16 {
		s.Dir = s.Dir.Mul(1 / n)
	}
	if !(s.Dir.Dot(inward) > 0) {
		return s, fmt.Errorf("Dir = %v points out of the tank (inward normal %v)", fmtVector(s.Dir), fmtVector(inward))
	}
	return s, nil
}

func finiteVector(v r3.Vector) bool {
	// v.X-v.X is NaN exactly when v.X is NaN or infinite.
	return v.X-v.X == 0 && v.Y-v.Y == 0 && v.Z-v.Z == 0
}

func fmtVector(v r3.Vector) string { return fmt.Sprintf("(%v, %v, %v)", v.X, v.Y, v.Z) }

// Tank returns the detector's tank.
func (d *Detector) Tank() Tank { return d.tank }

// Sensors returns a copy of the sensor list; Sensors()[i].Index == i.
func (d *Detector) Sensors() []Sensor { return append([]Sensor(nil), d.sensors...) }

// Sensor returns sensor i. It panics if i is out of range, like a slice.
func (d *Detector) Sensor(i int) Sensor { return d.sensors[i] }

// NumSensors returns the number of sensors.
func (d *Detector) NumSensors() int { return len(d.sensors) }

// CathodeDiameter returns the photocathode diameter (cm).
func (d *Detector) CathodeDiameter() float64 { return d.diameter }

// Coverage returns the photocathode coverage: the summed photocathode area,
// N pi (D/2)^2, over the sensor surface area Tank().InnerArea().
func (d *Detector) Coverage() float64 {
	return float64(len(d.sensors)) * math.Pi * d.rc2 / d.cyl.area()
}

// String summarizes the detector.
func (d *Detector) String() string {
	return fmt.Sprintf("detector: %d sensors of %g cm, coverage %.2f%%, %v",
		len(d.sensors), d.diameter, 100*d.Coverage(), d.tank)
}

// Contains reports whether p lies inside or on the sensor surface. It
// satisfies the phys.Volume interface.
func (d *Detector) Contains(p r3.Vector) bool { return d.cyl.contains(p) }

// Intersect returns the distance along the unit vector u from p to the point
// where the ray leaves the sensor cylinder, and the part of the surface it
// leaves through. p is normally inside or on the surface; a ray starting on
// the surface and moving out gives 0. For p outside, the result is the far
// crossing if the ray passes through the cylinder. A ray that never leaves
// the cylinder ahead of p, or a u that is zero, not finite or far from unit,
// gives (+Inf, NoSurface). The distance is in units of |u|, so u should be
// unit.
//
// Intersect does not allocate.
func (d *Detector) Intersect(p, u r3.Vector) (dist float64, s Surface) { return d.cyl.exit(p, u) }

// DistanceToWall returns the distance from p to the nearest point of the
// sensor surface: positive inside, negative outside (cm). It is the usual
// fiducial-volume variable.
func (d *Detector) DistanceToWall(p r3.Vector) float64 { return d.cyl.signedDistance(p) }

// DistanceAlong returns the distance from p along the direction u (any
// non-zero length; normalized here) to where the ray leaves the sensor
// cylinder: +Inf if it never does, NaN if u is zero or not finite.
func (d *Detector) DistanceAlong(p, u r3.Vector) float64 { return d.cyl.distanceAlong(p, u) }

// SensorAt returns the index of the sensor whose photocathode contains the
// wall point q on surface part s, or -1 if q falls on no photocathode. On
// the barrel the photocathode is the disk of diameter D measured along the
// surface (arc length r*dphi and dz); only the azimuth and z of q are used.
// On a cap it is the disk of diameter D in x, y; only x and y of q are used.
// s is normally the part returned by Intersect.
//
// SensorAt takes constant time (one cell of a uniform grid over the part,
// holding the few sensors that overlap it) and does not allocate.
func (d *Detector) SensorAt(q r3.Vector, s Surface) int {
	switch s {
	case Barrel:
		phi := math.Atan2(q.Y, q.X)
		g := &d.barrel
		lo, hi := g.cellRange(phi, q.Z)
		for _, e := range g.entries[lo:hi] {
			// dz alone rules most candidates out; arc^2 >= 0 and rounding
			// is monotone, so the full test could not pass either.
			dz := q.Z - e.v
			if dz*dz > d.rc2 {
				continue
			}
			arc := d.cyl.r * wrapAngle(phi-e.u)
			if arc*arc+dz*dz <= d.rc2 {
				return int(e.index)
			}
		}
	case Top, Bottom:
		g := &d.top
		if s == Bottom {
			g = &d.bottom
		}
		lo, hi := g.cellRange(q.X, q.Y)
		for _, e := range g.entries[lo:hi] {
			dx, dy := q.X-e.u, q.Y-e.v
			if dx*dx+dy*dy <= d.rc2 {
				return int(e.index)
			}
		}
	}
	return -1
}
