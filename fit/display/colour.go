package display

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/palette"
)

// The colours of the figures.
var (
	paper      = color.RGBA{R: 255, G: 255, B: 255, A: 255}
	wallFill   = color.RGBA{R: 236, G: 238, B: 242, A: 255}
	wallLine   = color.RGBA{R: 120, G: 126, B: 138, A: 255}
	sensorDot  = color.RGBA{R: 200, G: 204, B: 212, A: 255}
	ringColour = color.RGBA{R: 20, G: 20, B: 20, A: 255}
	markColour = color.RGBA{R: 200, G: 0, B: 120, A: 255}
	fillColour = color.RGBA{R: 150, G: 180, B: 215, A: 255}
	lineColour = color.RGBA{R: 30, G: 60, B: 120, A: 255}
	fitColour  = color.RGBA{R: 210, G: 60, B: 40, A: 255}
	flowColour = color.RGBA{R: 190, G: 190, B: 190, A: 255}
)

// seriesColours are the colours of successive series in study plots.
var seriesColours = []color.RGBA{
	{R: 31, G: 92, B: 168, A: 255},
	{R: 214, G: 96, B: 28, A: 255},
	{R: 34, G: 139, B: 80, A: 255},
	{R: 150, G: 50, B: 150, A: 255},
	{R: 90, G: 90, B: 90, A: 255},
	{R: 190, G: 40, B: 60, A: 255},
}

func seriesColour(i int) color.RGBA { return seriesColours[i%len(seriesColours)] }

// rampAnchors are the colours of the hit scale, early/low to late/high:
// deep blue, blue, teal, yellow-green, amber, red.
var rampAnchors = []color.RGBA{
	{R: 27, G: 31, B: 92, A: 255},
	{R: 31, G: 111, B: 168, A: 255},
	{R: 43, G: 179, B: 160, A: 255},
	{R: 184, G: 216, B: 74, A: 255},
	{R: 244, G: 165, B: 50, A: 255},
	{R: 216, G: 52, B: 60, A: 255},
}

// Ramp is the colour scale of the event display: a piecewise-linear RGB
// ramp through rampAnchors between Min and Max. It implements
// palette.ColorMap; values outside [Min, Max] are clamped by Clamped.
type Ramp struct {
	min, max, alpha float64
}

// NewRamp returns the ramp over [min, max].
func NewRamp(min, max float64) *Ramp { return &Ramp{min: min, max: max, alpha: 1} }

// At returns the colour of v, an error outside [Min, Max].
func (r *Ramp) At(v float64) (color.Color, error) {
	if !(v >= r.min && v <= r.max) {
		return nil, fmt.Errorf("display: value %g outside the colour scale [%g, %g]", v, r.min, r.max)
	}
	return r.Clamped(v), nil
}

// Clamped returns the colour of v, clamped to the ends of the scale.
func (r *Ramp) Clamped(v float64) color.Color {
	f := 0.5
	if r.max > r.min {
		f = (v - r.min) / (r.max - r.min)
	}
	if !(f > 0) {
		f = 0
	}
	if f > 1 {
		f = 1
	}
	x := f * float64(len(rampAnchors)-1)
	i := int(math.Min(x, float64(len(rampAnchors)-2)))
	t := x - float64(i)
	a, b := rampAnchors[i], rampAnchors[i+1]
	mix := func(p, q uint8) uint8 { return uint8(math.Round((float64(p)*(1-t) + float64(q)*t) * r.alpha)) }
	return color.RGBA{R: mix(a.R, b.R), G: mix(a.G, b.G), B: mix(a.B, b.B), A: uint8(math.Round(255 * r.alpha))}
}

// Max returns the top of the scale.
func (r *Ramp) Max() float64 { return r.max }

// Min returns the bottom of the scale.
func (r *Ramp) Min() float64 { return r.min }

// SetMax sets the top of the scale.
func (r *Ramp) SetMax(v float64) { r.max = v }

// SetMin sets the bottom of the scale.
func (r *Ramp) SetMin(v float64) { r.min = v }

// Alpha returns the opacity.
func (r *Ramp) Alpha() float64 { return r.alpha }

// SetAlpha sets the opacity (0..1); it panics outside, as palette.ColorMap
// documents.
func (r *Ramp) SetAlpha(a float64) {
	if !(a >= 0 && a <= 1) {
		panic(fmt.Sprintf("display: alpha = %g outside [0, 1]", a))
	}
	r.alpha = a
}

// Palette returns n colours evenly spaced along the ramp.
func (r *Ramp) Palette(n int) palette.Palette {
	cs := make([]color.Color, n)
	for i := range cs {
		v := r.min
		if n > 1 {
			v += (r.max - r.min) * float64(i) / float64(n-1)
		}
		cs[i] = r.Clamped(v)
	}
	return colours(cs)
}

type colours []color.Color

func (c colours) Colors() []color.Color { return c }
