package display

import (
	"math"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
)

// Unrolled maps points of a tank's sensor surface to the plane of the event
// display (package comment, "Unrolled tank"). Coordinates in cm.
type Unrolled struct {
	// R and H are the radius and half height of the sensor surface, Gap
	// the space between the barrel and each cap disk.
	R, H, Gap float64
}

// NewUnrolled returns the map of t's sensor surface, with a gap of 4% of
// the radius between the barrel and the caps.
func NewUnrolled(t geom.Tank) Unrolled {
	r := t.Radius - t.SensorOffset
	return Unrolled{R: r, H: t.Height/2 - t.SensorOffset, Gap: 0.04 * r}
}

// Project returns the display coordinates of the point q of surface s.
// A barrel point's radius is not used, nor a cap point's z.
func (u Unrolled) Project(q r3.Vector, s geom.Surface) (x, y float64) {
	switch s {
	case geom.Top:
		return q.Y, u.TopCentre() - q.X
	case geom.Bottom:
		return q.Y, -u.TopCentre() + q.X
	}
	return u.R * math.Atan2(q.Y, q.X), q.Z
}

// TopCentre is the display y of the top cap's centre (the bottom cap's is
// its negative).
func (u Unrolled) TopCentre() float64 { return u.H + u.Gap + u.R }

// Extent returns the display rectangle holding the whole surface.
func (u Unrolled) Extent() (xmin, xmax, ymin, ymax float64) {
	w := math.Pi * u.R
	return -w, w, -u.TopCentre() - u.R, u.TopCentre() + u.R
}

// jump reports whether two consecutive display points of a traced curve
// must not be joined: another surface, or the barrel cut at azimuth pi.
func (u Unrolled) jump(s0, s1 geom.Surface, x0, x1 float64) bool {
	return s0 != s1 || (s0 == geom.Barrel && math.Abs(x1-x0) > math.Pi*u.R)
}
