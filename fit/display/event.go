package display

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// ColorBy selects the hit quantity the event display colours.
type ColorBy int

// The colour quantities.
const (
	ByTime   ColorBy = iota // hit time (ns)
	ByCharge                // hit charge (pe)
)

// Track is a fitted track to draw on the event display: the vertex (cm)
// and unit direction, and the cosine of the Cherenkov angle of its ring
// (1/n for a particle at the speed of light, n the refractive index).
type Track struct {
	Vertex, Dir  r3.Vector
	CosCherenkov float64
	// Label names the fit in the legend, e.g. "low-energy fit".
	Label string
}

func (t *Track) validate(d *geom.Detector) error {
	for _, f := range []struct {
		name string
		v    float64
	}{{"Vertex.X", t.Vertex.X}, {"Vertex.Y", t.Vertex.Y}, {"Vertex.Z", t.Vertex.Z}, {"Dir.X", t.Dir.X}, {"Dir.Y", t.Dir.Y}, {"Dir.Z", t.Dir.Z}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return fmt.Errorf("display: Track.%s = %g must be finite", f.name, f.v)
		}
	}
	if n := t.Dir.Norm(); math.Abs(n-1) > 1e-6 {
		return fmt.Errorf("display: Track.Dir has length %g, must be a unit vector", n)
	}
	if !(t.CosCherenkov > 0 && t.CosCherenkov < 1) {
		return fmt.Errorf("display: Track.CosCherenkov = %g must be in (0, 1)", t.CosCherenkov)
	}
	if !d.Contains(t.Vertex) {
		return fmt.Errorf("display: Track.Vertex = %v is outside the sensor surface", t.Vertex)
	}
	return nil
}

// EventConfig describes an event display.
type EventConfig struct {
	// Detector is the tank and its sensors (required).
	Detector *geom.Detector
	// Hits are the event's hits; every sensor index must be valid and
	// every time and charge finite.
	Hits []pmt.Hit
	// Track, if not nil, is drawn: its ring (the Cherenkov cone from the
	// vertex about the direction, traced to the wall), the vertex projected
	// radially onto the barrel and the point where the track direction
	// meets the wall.
	Track *Track
	// ColorBy chooses the colour quantity; the marker area grows with the
	// charge either way.
	ColorBy ColorBy
	// Title is the figure's title.
	Title string
	// HideSensors leaves out the faint dots marking every sensor.
	HideSensors bool
	// RingPoints is the number of rays traced on the cone; 0 means 1440.
	RingPoints int
}

// EventDisplay is the picture of one event on the unrolled tank, with a
// colour scale beside it and the legend below it. Build it with
// NewEventDisplay.
type EventDisplay struct {
	main, scale *plot.Plot
	u           Unrolled
	// Ring holds the display polylines of the fitted ring (cm), split where
	// it crosses from one surface to another or the barrel cut; nil without
	// a track.
	Ring []plotter.XYs
	// Scale is the colour scale of the hits.
	Scale ColourScale
}

// ColourScale is the range of the hit colours and what lies beyond it.
// The scale spans the bulk of the values, so that late dark and
// scattered-light hits or one bright sensor do not wash out the rest:
// times from the 2% to the 75% quantile, charges from 0 to the 98% one.
// Hits beyond an end are drawn in that end's colour; the scale marks an
// end that clamps hits with a triangle and a "<=" or ">=" label, and the
// legend counts them.
type ColourScale struct {
	Min, Max float64
	// Below and Above count the hits drawn in the end colours because
	// their value is beyond Min or Max.
	Below, Above int
}

// NewEventDisplay builds the event display described by cfg.
func NewEventDisplay(cfg EventConfig) (*EventDisplay, error) {
	d := cfg.Detector
	if d == nil {
		return nil, fmt.Errorf("display: EventConfig.Detector is nil")
	}
	if err := checkHits(d, cfg.Hits); err != nil {
		return nil, err
	}
	if cfg.ColorBy != ByTime && cfg.ColorBy != ByCharge {
		return nil, fmt.Errorf("display: EventConfig.ColorBy = %d is not ByTime or ByCharge", cfg.ColorBy)
	}
	if cfg.RingPoints < 0 {
		return nil, fmt.Errorf("display: EventConfig.RingPoints = %d must not be negative", cfg.RingPoints)
	}
	u := NewUnrolled(d.Tank())
	e := &EventDisplay{u: u, main: plot.New(), scale: plot.New()}
	p := e.main
	p.Title.Text = cfg.Title
	p.X.Label.Text = "barrel: arc length R·φ (cm); caps: unfolded at φ = 0"
	p.Y.Label.Text = "z (cm)"
	p.Legend.TextStyle.Font.Size = vg.Points(9)
	p.Legend.Padding = vg.Points(2)
	tidyAxes(p)
	p.Add(surfaces{u})

	sensors := d.Sensors()
	if !cfg.HideSensors {
		xy := make(plotter.XYs, len(sensors))
		for i, s := range sensors {
			xy[i].X, xy[i].Y = u.Project(s.Pos, s.Surface)
		}
		sc, err := plotter.NewScatter(xy)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle = draw.GlyphStyle{Color: sensorDot, Radius: vg.Points(0.5), Shape: draw.CircleGlyph{}}
		p.Add(sc)
	}

	if len(cfg.Hits) > 0 {
		if err := e.addHits(cfg, sensors); err != nil {
			return nil, err
		}
	}
	if cfg.Track != nil {
		if err := e.addTrack(d, *cfg.Track, cfg.RingPoints); err != nil {
			return nil, err
		}
	}
	xmin, xmax, ymin, ymax := u.Extent()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = xmin, xmax, ymin, ymax
	return e, nil
}

func checkHits(d *geom.Detector, hits []pmt.Hit) error {
	for i, h := range hits {
		if h.Sensor < 0 || h.Sensor >= d.NumSensors() {
			return fmt.Errorf("display: Hits[%d].Sensor = %d outside 0..%d", i, h.Sensor, d.NumSensors()-1)
		}
		if math.IsNaN(h.Time) || math.IsInf(h.Time, 0) {
			return fmt.Errorf("display: Hits[%d].Time = %g must be finite", i, h.Time)
		}
		if math.IsNaN(h.Charge) || math.IsInf(h.Charge, 0) || h.Charge < 0 {
			return fmt.Errorf("display: Hits[%d].Charge = %g must be finite and non-negative", i, h.Charge)
		}
	}
	return nil
}

// markerRadius is the hit marker radius for charge q (pe): the area grows
// linearly with the charge up to 30 pe.
func markerRadius(q float64) vg.Length {
	return vg.Points(1.3 + 1.1*math.Sqrt(math.Min(q, 30)))
}

func (e *EventDisplay) addHits(cfg EventConfig, sensors []geom.Sensor) error {
	hits := append([]pmt.Hit(nil), cfg.Hits...)
	// Large markers first, so that small ones stay visible on top.
	sort.SliceStable(hits, func(i, j int) bool { return hits[i].Charge > hits[j].Charge })
	vals := make([]float64, len(hits))
	for i, h := range hits {
		if cfg.ColorBy == ByTime {
			vals[i] = h.Time
		} else {
			vals[i] = h.Charge
		}
	}
	s := append([]float64(nil), vals...)
	sort.Float64s(s)
	lo, hi := s[int(0.02*float64(len(s)-1))], s[int(0.75*float64(len(s)-1))]
	unit, name := "ns", "hit time"
	if cfg.ColorBy == ByCharge {
		lo, hi = 0, s[int(0.98*float64(len(s)-1))]
		unit, name = "pe", "hit charge"
	}
	if !(hi > lo) {
		hi = lo + 1
	}
	// Round the ends outwards to a tenth of the range's decade, so that
	// they read as plain numbers.
	step := math.Pow(10, math.Floor(math.Log10((hi-lo)/10)))
	lo, hi = math.Floor(lo/step)*step, math.Ceil(hi/step)*step
	e.Scale = ColourScale{Min: lo, Max: hi}
	for _, v := range vals {
		if v < lo {
			e.Scale.Below++
		} else if v > hi {
			e.Scale.Above++
		}
	}
	ramp := NewRamp(lo, hi)
	xy := make(plotter.XYs, len(hits))
	for i, h := range hits {
		sn := sensors[h.Sensor]
		xy[i].X, xy[i].Y = e.u.Project(sn.Pos, sn.Surface)
	}
	sc, err := plotter.NewScatter(xy)
	if err != nil {
		return err
	}
	sc.GlyphStyle = draw.GlyphStyle{Color: ramp.Clamped((lo + hi) / 2), Radius: markerRadius(2), Shape: draw.CircleGlyph{}}
	sc.GlyphStyleFunc = func(i int) draw.GlyphStyle {
		return draw.GlyphStyle{Color: ramp.Clamped(vals[i]), Radius: markerRadius(hits[i].Charge), Shape: draw.CircleGlyph{}}
	}
	e.main.Add(sc)
	e.main.Legend.Add(fmt.Sprintf("%d hits (marker size grows with charge)", len(hits)), sc)
	dec := decimals([]float64{lo, hi})
	if e.Scale.Below > 0 || e.Scale.Above > 0 {
		var parts []string
		if e.Scale.Above > 0 {
			parts = append(parts, fmt.Sprintf("%d hits with %s ≥ %s %s", e.Scale.Above, name, formatTick(hi, dec), unit))
		}
		if e.Scale.Below > 0 {
			parts = append(parts, fmt.Sprintf("%d with %s ≤ %s %s", e.Scale.Below, name, formatTick(lo, dec), unit))
		}
		e.main.Legend.Add(strings.Join(parts, ", ")+": drawn in the end colours of the scale", clampThumb{ramp: ramp, below: e.Scale.Below > 0, above: e.Scale.Above > 0})
	}

	e.scale.Add(&plotter.ColorBar{ColorMap: ramp, Vertical: true, Colors: 64})
	ext := 0.07 * (hi - lo)
	caps := clampCaps{ramp: ramp, ext: ext, below: e.Scale.Below > 0, above: e.Scale.Above > 0}
	e.scale.Add(caps)
	e.scale.HideX()
	e.scale.Y.Label.Text = name + " (" + unit + ")"
	e.scale.Y.Min, e.scale.Y.Max = lo, hi
	if caps.below {
		e.scale.Y.Min = lo - ext
	}
	if caps.above {
		e.scale.Y.Max = hi + ext
	}
	e.scale.Y.Tick.Marker = caps
	return nil
}

// clampCaps draws a triangle in the end colour beyond each end of the
// colour bar that clamps values, and labels the ends "≤ min" and "≥ max".
type clampCaps struct {
	ramp         *Ramp
	ext          float64
	below, above bool
}

func (k clampCaps) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x0, x1 := trX(0), trX(1)
	for _, end := range []struct {
		on      bool
		base, y float64
	}{{k.below, k.ramp.Min(), k.ramp.Min() - k.ext}, {k.above, k.ramp.Max(), k.ramp.Max() + k.ext}} {
		if !end.on {
			continue
		}
		var t vg.Path
		t.Move(vg.Point{X: x0, Y: trY(end.base)})
		t.Line(vg.Point{X: x1, Y: trY(end.base)})
		t.Line(vg.Point{X: (x0 + x1) / 2, Y: trY(end.y)})
		t.Close()
		c.SetColor(k.ramp.Clamped(end.base))
		c.Fill(t)
	}
}

// Ticks labels the scale: tidy ticks inside, the clamping ends marked.
func (k clampCaps) Ticks(min, max float64) []plot.Tick {
	lo, hi := k.ramp.Min(), k.ramp.Max()
	var ts []plot.Tick
	for _, t := range (tidyTicks{plot.DefaultTicks{}}).Ticks(lo, hi) {
		if t.Value < lo || t.Value > hi || (t.Label != "" && ((k.below && t.Value-lo < 1.5*k.ext) || (k.above && hi-t.Value < 1.5*k.ext))) {
			continue
		}
		ts = append(ts, t)
	}
	dec := decimals([]float64{lo, hi})
	if k.below {
		ts = append(ts, plot.Tick{Value: lo, Label: "≤ " + formatTick(lo, dec)})
	}
	if k.above {
		ts = append(ts, plot.Tick{Value: hi, Label: "≥ " + formatTick(hi, dec)})
	}
	return ts
}

// clampThumb is the legend icon of the clamped hits: the end colours
// that clamp, side by side.
type clampThumb struct {
	ramp         *Ramp
	below, above bool
}

func (t clampThumb) Thumbnail(c *draw.Canvas) {
	var ends []float64
	if t.below {
		ends = append(ends, t.ramp.Min())
	}
	if t.above {
		ends = append(ends, t.ramp.Max())
	}
	w := (c.Max.X - c.Min.X) / vg.Length(max(1, len(ends)))
	for i, v := range ends {
		x := c.Min.X + vg.Length(i)*w
		var r vg.Path
		r.Move(vg.Point{X: x, Y: c.Min.Y})
		r.Line(vg.Point{X: x + w, Y: c.Min.Y})
		r.Line(vg.Point{X: x + w, Y: c.Max.Y})
		r.Line(vg.Point{X: x, Y: c.Max.Y})
		r.Close()
		c.SetColor(t.ramp.Clamped(v))
		c.Fill(r)
	}
}

func (e *EventDisplay) addTrack(d *geom.Detector, tr Track, n int) error {
	if err := tr.validate(d); err != nil {
		return err
	}
	label := tr.Label
	if label == "" {
		label = "fit"
	}
	ring, err := RingPolylines(d, tr, n)
	if err != nil {
		return err
	}
	e.Ring = ring
	for i, pl := range ring {
		if len(pl) < 2 {
			continue
		}
		l, err := plotter.NewLine(pl)
		if err != nil {
			return err
		}
		l.LineStyle = draw.LineStyle{Color: ringColour, Width: vg.Points(1.4)}
		e.main.Add(l)
		if i == 0 {
			e.main.Legend.Add(label+": ring", l)
		}
	}
	vx, vy := e.u.Project(tr.Vertex, geom.Barrel)
	v, err := plotter.NewScatter(plotter.XYs{{X: vx, Y: vy}})
	if err != nil {
		return err
	}
	v.GlyphStyle = draw.GlyphStyle{Color: markColour, Radius: vg.Points(5), Shape: draw.CrossGlyph{}}
	e.main.Add(v)
	e.main.Legend.Add(label+": vertex (radial projection)", v)
	if dist, s := d.Intersect(tr.Vertex, tr.Dir); s != geom.NoSurface {
		ax, ay := e.u.Project(tr.Vertex.Add(tr.Dir.Mul(dist)), s)
		a, err := plotter.NewScatter(plotter.XYs{{X: ax, Y: ay}})
		if err != nil {
			return err
		}
		a.GlyphStyle = draw.GlyphStyle{Color: markColour, Radius: vg.Points(5), Shape: draw.RingGlyph{}}
		e.main.Add(a)
		e.main.Legend.Add(label+": direction at the wall", a)
	}
	return nil
}

// RingPolylines traces n rays (0 means 1440) on the Cherenkov cone of tr
// from its vertex to the sensor surface (geom.Detector.Intersect) and
// returns the wall points in display coordinates, as polylines split
// where the ring passes to another surface or across the barrel cut.
func RingPolylines(d *geom.Detector, tr Track, n int) ([]plotter.XYs, error) {
	if d == nil {
		return nil, fmt.Errorf("display: RingPolylines: nil detector")
	}
	if err := tr.validate(d); err != nil {
		return nil, err
	}
	if n == 0 {
		n = 1440
	}
	if n < 8 {
		return nil, fmt.Errorf("display: ring points = %d must be at least 8", n)
	}
	u := NewUnrolled(d.Tank())
	var out []plotter.XYs
	var cur plotter.XYs
	last := geom.NoSurface
	var lastX float64
	for k := 0; k <= n; k++ {
		dir := phys.Deflect(tr.Dir, tr.CosCherenkov, 2*math.Pi*float64(k)/float64(n))
		dist, s := d.Intersect(tr.Vertex, dir)
		if s == geom.NoSurface {
			continue
		}
		x, y := u.Project(tr.Vertex.Add(dir.Mul(dist)), s)
		if len(cur) > 0 && u.jump(last, s, lastX, x) {
			out = append(out, cur)
			cur = nil
		}
		cur = append(cur, plotter.XY{X: x, Y: y})
		last, lastX = s, x
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	// The trace starts at an arbitrary azimuth: join the last piece to
	// the first when they continue each other on the same surface.
	if len(out) > 1 {
		a, b := out[len(out)-1], out[0]
		if pa, pb := a[len(a)-1], b[0]; math.Hypot(pa.X-pb.X, pa.Y-pb.Y) < 1e-9 {
			out[0] = append(a, b[1:]...)
			out = out[:len(out)-1]
		}
	}
	return out, nil
}

// surfaces draws the barrel rectangle and the two cap disks.
type surfaces struct{ u Unrolled }

func (s surfaces) DataRange() (xmin, xmax, ymin, ymax float64) { return s.u.Extent() }

func (s surfaces) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	w := math.Pi * s.u.R
	var rect vg.Path
	rect.Move(vg.Point{X: trX(-w), Y: trY(-s.u.H)})
	rect.Line(vg.Point{X: trX(w), Y: trY(-s.u.H)})
	rect.Line(vg.Point{X: trX(w), Y: trY(s.u.H)})
	rect.Line(vg.Point{X: trX(-w), Y: trY(s.u.H)})
	rect.Close()
	paths := []vg.Path{rect}
	for _, cy := range []float64{s.u.TopCentre(), -s.u.TopCentre()} {
		var disk vg.Path
		const n = 180
		for k := 0; k <= n; k++ {
			a := 2 * math.Pi * float64(k) / n
			pt := vg.Point{X: trX(s.u.R * math.Cos(a)), Y: trY(cy + s.u.R*math.Sin(a))}
			if k == 0 {
				disk.Move(pt)
			} else {
				disk.Line(pt)
			}
		}
		disk.Close()
		paths = append(paths, disk)
	}
	for _, pa := range paths {
		c.SetColor(wallFill)
		c.Fill(pa)
		c.SetLineStyle(draw.LineStyle{Color: wallLine, Width: vg.Points(0.8)})
		c.Stroke(pa)
	}
}

// Draw draws the display on c: the unrolled tank at equal scale in x and
// y, the colour scale on the right and the legend below, off the tank.
func (e *EventDisplay) Draw(c draw.Canvas) {
	barW := 1.2 * vg.Inch
	if c.Max.X-c.Min.X < 4*barW {
		barW = (c.Max.X - c.Min.X) / 4
	}
	mainC, barC := c, c
	mainC.Max.X = c.Max.X - barW
	barC.Min.X = c.Max.X - barW + barW/5
	h := c.Max.Y - c.Min.Y
	barC.Min.Y += 0.2 * h
	barC.Max.Y -= 0.2 * h
	band := legendHeight(&e.main.Legend, c)
	if band > 0 {
		mainC.Min.Y += band + legendGap
	}

	// Equal scale: widen whichever range leaves room in the data area.
	xmin, xmax, ymin, ymax := e.u.Extent()
	p := withoutLegend(e.main)
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = xmin, xmax, ymin, ymax
	dc := p.DataCanvas(mainC)
	dw, dh := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
	if dw > 0 && dh > 0 {
		scale := math.Min(dw/(xmax-xmin), dh/(ymax-ymin))
		cx, cy := (xmin+xmax)/2, (ymin+ymax)/2
		p.X.Min, p.X.Max = cx-dw/scale/2, cx+dw/scale/2
		p.Y.Min, p.Y.Max = cy-dh/scale/2, cy+dh/scale/2
	}
	p.Draw(mainC)
	if band > 0 {
		l := e.main.Legend
		l.Top, l.Left, l.XOffs, l.YOffs = true, true, 0, 0
		l.Draw(draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
			Min: vg.Point{X: dc.Min.X, Y: c.Min.Y}, Max: vg.Point{X: c.Max.X, Y: c.Min.Y + band}}})
	}
	if len(e.scale.Y.Label.Text) > 0 {
		e.scale.Draw(barC)
	}
}
