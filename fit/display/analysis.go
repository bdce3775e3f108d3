package display

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

func checkVector(name string, v r3.Vector) error {
	for _, c := range []float64{v.X, v.Y, v.Z} {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return fmt.Errorf("display: %s = %v must be finite", name, v)
		}
	}
	return nil
}

// Residuals returns the hit-time residuals t_i - t0 - |x_i - v| / vg (ns)
// of the hits for the vertex v (cm), time t0 (ns) and group velocity vg
// (cm/ns), x_i the sensor positions, in hit order.
func Residuals(d *geom.Detector, hits []pmt.Hit, v r3.Vector, t0, vg float64) ([]float64, error) {
	if d == nil {
		return nil, fmt.Errorf("display: Residuals: nil detector")
	}
	if err := checkHits(d, hits); err != nil {
		return nil, err
	}
	if err := checkVector("vertex", v); err != nil {
		return nil, err
	}
	if math.IsNaN(t0) || math.IsInf(t0, 0) {
		return nil, fmt.Errorf("display: time = %g must be finite", t0)
	}
	if !(vg > 0) || math.IsInf(vg, 1) {
		return nil, fmt.Errorf("display: group velocity = %g must be positive and finite", vg)
	}
	res := make([]float64, len(hits))
	for i, h := range hits {
		res[i] = h.Time - t0 - d.Sensor(h.Sensor).Pos.Sub(v).Norm()/vg
	}
	return res, nil
}

// ResidualConfig describes a hit-time residual histogram.
type ResidualConfig struct {
	Detector *geom.Detector
	Hits     []pmt.Hit
	// Vertex (cm) and Time (ns) are the fitted emission point and time,
	// GroupVelocity (cm/ns) the velocity the fit converts paths to times
	// with (fit.Fitter.GroupVelocity).
	Vertex        r3.Vector
	Time          float64
	GroupVelocity float64
	// Lo, Hi (ns) is the histogram range; both zero means -30 .. 90 ns.
	// Bins is the number of bins; 0 means 60.
	Lo, Hi float64
	Bins   int
	// PromptLo, PromptHi (ns), if different, mark the prompt window
	// (fit.Fitter.PromptWindow) with two lines.
	PromptLo, PromptHi float64
	Title              string
}

// NewResidualPlot returns the histogram of the hits' time residuals.
// Residuals outside the range are counted in an underflow and an overflow
// bin drawn apart from the histogram, in grey and labelled as such; the
// title's second line defines t0, v and v_g.
func NewResidualPlot(cfg ResidualConfig) (*plot.Plot, error) {
	res, err := Residuals(cfg.Detector, cfg.Hits, cfg.Vertex, cfg.Time, cfg.GroupVelocity)
	if err != nil {
		return nil, err
	}
	lo, hi, bins := cfg.Lo, cfg.Hi, cfg.Bins
	if lo == 0 && hi == 0 {
		lo, hi = -30, 90
	}
	if !(hi > lo) || math.IsInf(hi-lo, 0) {
		return nil, fmt.Errorf("display: ResidualConfig.Lo, Hi = %g, %g: need Lo < Hi, both finite", lo, hi)
	}
	if bins == 0 {
		bins = 60
	}
	if bins < 1 || bins > 10000 {
		return nil, fmt.Errorf("display: ResidualConfig.Bins = %d must be in 1..10000", bins)
	}
	h, under, over := histogram(res, lo, hi, bins)
	p := plot.New()
	p.Title.Text = cfg.Title + "\n" + fmt.Sprintf("t0, v: fitted time, vertex; x: sensor; v_g = %.4g cm/ns", cfg.GroupVelocity)
	if cfg.Title == "" {
		p.Title.Text = p.Title.Text[1:]
	}
	p.X.Label.Text = "time residual t - t0 - |x - v| / v_g (ns)"
	p.Y.Label.Text = fmt.Sprintf("hits / %.3g ns", (hi-lo)/float64(bins))
	bar, err := newBars(h, lo, hi)
	if err != nil {
		return nil, err
	}
	p.Add(bar)
	p.Legend.Add(fmt.Sprintf("%d hits, %d of them outside %s to %s ns (grey bins)", len(res), under+over, formatTick(lo, decimals([]float64{lo, hi})), formatTick(hi, decimals([]float64{lo, hi}))), bar)
	top := 0.0
	for _, c := range h {
		top = math.Max(top, c)
	}
	top = math.Max(top, float64(max(under, over)))
	if cfg.PromptHi > cfg.PromptLo {
		for i, x := range []float64{cfg.PromptLo, cfg.PromptHi} {
			l, err := plotter.NewLine(plotter.XYs{{X: x, Y: 0}, {X: x, Y: 1.05 * top}})
			if err != nil {
				return nil, err
			}
			l.LineStyle = draw.LineStyle{Color: fitColour, Width: vg.Points(1), Dashes: []vg.Length{vg.Points(4), vg.Points(3)}}
			p.Add(l)
			if i == 0 {
				p.Legend.Add("prompt window", l)
			}
		}
	}
	addFlow(p, lo, hi, bins, under, over, " ns")
	p.Y.Min, p.Y.Max = 0, 1.15*top
	return p, nil
}

// histogram counts x in bins equal bins of [lo, hi) and returns the
// counts below lo (under) and at or above hi (over) apart.
func histogram(x []float64, lo, hi float64, bins int) (h []float64, under, over int) {
	h = make([]float64, bins)
	for _, v := range x {
		switch i := int(math.Floor((v - lo) / (hi - lo) * float64(bins))); {
		case v < lo:
			under++
		case v >= hi || i >= bins:
			over++
		default:
			h[max(0, i)]++
		}
	}
	return h, under, over
}

// flowBins draws the underflow and overflow of a histogram over [lo, hi)
// as two grey bars apart from it, each labelled with what it holds.
type flowBins struct {
	lo, hi, width, gap float64
	under, over        int
	unit               string
}

// flowBars returns the x extent of the underflow and overflow bars.
func (f flowBins) bars() [2][2]float64 {
	return [2][2]float64{{f.lo - f.gap - f.width, f.lo - f.gap}, {f.hi + f.gap, f.hi + f.gap + f.width}}
}

func (f flowBins) DataRange() (xmin, xmax, ymin, ymax float64) {
	b := f.bars()
	return b[0][0], b[1][1], 0, float64(max(f.under, f.over))
}

// label returns the text over bar i (0 underflow, 1 overflow) and its count.
func (f flowBins) label(i int) (string, int) {
	dec := decimals([]float64{f.lo, f.hi})
	if i == 0 {
		return fmt.Sprintf("underflow\n< %s%s\n%d", formatTick(f.lo, dec), f.unit, f.under), f.under
	}
	return fmt.Sprintf("overflow\n≥ %s%s\n%d", formatTick(f.hi, dec), f.unit, f.over), f.over
}

func (f flowBins) style(p *plot.Plot) text.Style {
	sty := p.X.Tick.Label
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YBottom
	return sty
}

// GlyphBoxes keeps the labels inside the plot.
func (f flowBins) GlyphBoxes(p *plot.Plot) []plot.GlyphBox {
	var bs []plot.GlyphBox
	sty := f.style(p)
	for i, b := range f.bars() {
		t, n := f.label(i)
		r := sty.Rectangle(t)
		w, h := r.Max.X-r.Min.X, r.Max.Y-r.Min.Y
		bs = append(bs, plot.GlyphBox{X: p.X.Norm((b[0] + b[1]) / 2), Y: p.Y.Norm(float64(n)),
			Rectangle: vg.Rectangle{Min: vg.Point{X: -w / 2, Y: 0}, Max: vg.Point{X: w / 2, Y: h + vg.Points(2)}}})
	}
	return bs
}

func (f flowBins) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	sty := f.style(p)
	for i, b := range f.bars() {
		text, n := f.label(i)
		x0, x1, y0, y1 := trX(b[0]), trX(b[1]), trY(0), trY(float64(n))
		var r vg.Path
		r.Move(vg.Point{X: x0, Y: y0})
		r.Line(vg.Point{X: x1, Y: y0})
		r.Line(vg.Point{X: x1, Y: y1})
		r.Line(vg.Point{X: x0, Y: y1})
		r.Close()
		c.SetColor(flowColour)
		c.Fill(r)
		c.SetLineStyle(draw.LineStyle{Color: wallLine, Width: vg.Points(0.6)})
		c.Stroke(r)
		c.FillText(sty, vg.Point{X: (x0 + x1) / 2, Y: y1 + vg.Points(2)}, text)
	}
}

// addFlow adds the under- and overflow bars of a histogram of bins bins
// over [lo, hi) to p and restricts the axis's labelled ticks to [lo, hi].
func addFlow(p *plot.Plot, lo, hi float64, bins, under, over int, unit string) {
	span := hi - lo
	f := flowBins{lo: lo, hi: hi, width: math.Max(0.06*span, 2*span/float64(bins)), gap: 0.03 * span, under: under, over: over, unit: unit}
	p.Add(f)
	b := f.bars()
	p.X.Min, p.X.Max = b[0][0], b[1][1]
	p.X.Tick.Marker = rangeTicks{lo: lo, hi: hi}
	tidyAxes(p)
}

// newBars draws counts as a histogram of equal bins over [lo, hi].
func newBars(counts []float64, lo, hi float64) (*plotter.Histogram, error) {
	w := (hi - lo) / float64(len(counts))
	xy := make(plotter.XYs, len(counts))
	for i, c := range counts {
		xy[i] = plotter.XY{X: lo + (float64(i)+0.5)*w, Y: c}
	}
	h, err := plotter.NewHistogram(xy, len(counts))
	if err != nil {
		return nil, err
	}
	h.FillColor = fillColour
	h.LineStyle = draw.LineStyle{Color: lineColour, Width: vg.Points(0.6)}
	return h, nil
}

// rangeTicks puts the default ticks over [lo, hi] only, whatever the
// axis range, so that no number is written under the flow bins.
type rangeTicks struct{ lo, hi float64 }

func (r rangeTicks) Ticks(min, max float64) []plot.Tick {
	return plot.DefaultTicks{}.Ticks(r.lo, r.hi)
}

// ProfileBin is one angular bin of a charge profile: the bin [Lo, Hi) in
// degrees and the mean charge per sensor (hit or not, pe) of the sensors
// whose direction from the vertex lies in it, with its standard error.
type ProfileBin struct {
	Lo, Hi float64
	// Sensors counts the sensors in the bin, HitSensors those with a hit,
	// and Charge is their summed charge (pe).
	Sensors, HitSensors int
	Charge              float64
	Mean, Err           float64
}

// ChargeProfile returns the mean charge per sensor (pe) against the angle
// between dir and the line from vertex v to the sensor, in bins equal bins
// of [0, 180) degrees. Every sensor counts, so the profile is the light per
// sensor at each angle, not only where there were hits; the hits of one
// sensor add up.
func ChargeProfile(d *geom.Detector, hits []pmt.Hit, v, dir r3.Vector, bins int) ([]ProfileBin, error) {
	if d == nil {
		return nil, fmt.Errorf("display: ChargeProfile: nil detector")
	}
	if err := checkHits(d, hits); err != nil {
		return nil, err
	}
	if err := checkVector("vertex", v); err != nil {
		return nil, err
	}
	if err := checkVector("direction", dir); err != nil {
		return nil, err
	}
	if n := dir.Norm(); math.Abs(n-1) > 1e-6 {
		return nil, fmt.Errorf("display: direction has length %g, must be a unit vector", n)
	}
	if bins < 1 || bins > 1800 {
		return nil, fmt.Errorf("display: profile bins = %d must be in 1..1800", bins)
	}
	q := make([]float64, d.NumSensors())
	hit := make([]bool, d.NumSensors())
	for _, h := range hits {
		q[h.Sensor] += h.Charge
		hit[h.Sensor] = true
	}
	out := make([]ProfileBin, bins)
	sum2 := make([]float64, bins)
	w := 180 / float64(bins)
	for i := range out {
		out[i].Lo, out[i].Hi = float64(i)*w, float64(i+1)*w
	}
	for i, s := range d.Sensors() {
		r := s.Pos.Sub(v)
		n := r.Norm()
		if n == 0 {
			continue
		}
		ang := math.Acos(math.Max(-1, math.Min(1, r.Dot(dir)/n))) * 180 / math.Pi
		b := min(bins-1, int(ang/w))
		out[b].Sensors++
		out[b].Charge += q[i]
		sum2[b] += q[i] * q[i]
		if hit[i] {
			out[b].HitSensors++
		}
	}
	for i := range out {
		n := float64(out[i].Sensors)
		if n == 0 {
			continue
		}
		m := out[i].Charge / n
		out[i].Mean = m
		if n > 1 {
			out[i].Err = math.Sqrt(math.Max(0, (sum2[i]/n-m*m)*n/(n-1)) / n)
		}
	}
	return out, nil
}

// ProfileConfig describes a charge-vs-angle plot of a fitted ring.
type ProfileConfig struct {
	Detector *geom.Detector
	Hits     []pmt.Hit
	// Vertex and Dir are the fitted track; CosCherenkov, if in (0, 1),
	// marks the Cherenkov angle.
	Vertex, Dir  r3.Vector
	CosCherenkov float64
	// Bins over 0..180 degrees; 0 means 90.
	Bins  int
	Title string
}

// NewChargeProfilePlot returns the mean charge per sensor against the
// angle to the fitted direction (ChargeProfile) with its standard errors.
func NewChargeProfilePlot(cfg ProfileConfig) (*plot.Plot, error) {
	bins := cfg.Bins
	if bins == 0 {
		bins = 90
	}
	prof, err := ChargeProfile(cfg.Detector, cfg.Hits, cfg.Vertex, cfg.Dir, bins)
	if err != nil {
		return nil, err
	}
	var pts []Point
	for _, b := range prof {
		if b.Sensors > 0 {
			pts = append(pts, Point{X: (b.Lo + b.Hi) / 2, Y: b.Mean, Err: b.Err})
		}
	}
	p := plot.New()
	p.Title.Text = cfg.Title
	p.X.Label.Text = "angle between fitted direction and vertex-to-sensor line (deg)"
	p.Y.Label.Text = "mean charge per sensor (pe)"
	if err := addSeries(p, Series{Name: "all sensors", Points: pts}, 0, false); err != nil {
		return nil, err
	}
	if c := cfg.CosCherenkov; c > 0 && c < 1 {
		top := 0.0
		for _, q := range pts {
			top = math.Max(top, q.Y+q.Err)
		}
		a := math.Acos(c) * 180 / math.Pi
		l, err := plotter.NewLine(plotter.XYs{{X: a, Y: 0}, {X: a, Y: top}})
		if err != nil {
			return nil, err
		}
		l.LineStyle = draw.LineStyle{Color: fitColour, Width: vg.Points(1), Dashes: []vg.Length{vg.Points(4), vg.Points(3)}}
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("Cherenkov angle %.1f°", a), l)
	}
	p.X.Min, p.X.Max = 0, 180
	tidyAxes(p)
	return p, nil
}
