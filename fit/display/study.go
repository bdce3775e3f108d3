package display

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/conelight/conelight/fit/resolution"
)

// Point is one measurement of a study: at X, the value Y with its 1-sigma
// statistical error Err, or with the asymmetric errors ErrLo below and
// ErrHi above Y when either is set; or, when Limit is resolution.UpperLimit
// or resolution.LowerLimit, a one-sided limit at Y, drawn as a bar with an
// arrow pointing into the allowed side and no error bar.
type Point struct {
	X, Y, Err    float64
	ErrLo, ErrHi float64
	Limit        resolution.Bound
}

// PointOf returns the point at x of a resolution estimate.
func PointOf(x float64, e resolution.Estimate) Point { return Point{X: x, Y: e.Value, Err: e.Err} }

// PointOfProportion returns the point at x of a binomial proportion,
// scaled by scale (100 for percent): the central interval as asymmetric
// errors, a one-sided limit as a limit point.
func PointOfProportion(x float64, b resolution.Binomial, scale float64) Point {
	switch b.Bound {
	case resolution.UpperLimit:
		return Point{X: x, Y: scale * b.Hi, Limit: resolution.UpperLimit}
	case resolution.LowerLimit:
		return Point{X: x, Y: scale * b.Lo, Limit: resolution.LowerLimit}
	}
	return Point{X: x, Y: scale * b.Value, ErrLo: scale * (b.Value - b.Lo), ErrHi: scale * (b.Hi - b.Value)}
}

// errors returns the error below and above Y.
func (q Point) errors() (lo, hi float64) {
	if q.Limit != resolution.Central {
		return 0, 0
	}
	if q.ErrLo != 0 || q.ErrHi != 0 {
		return q.ErrLo, q.ErrHi
	}
	return q.Err, q.Err
}

// Series is a named set of points drawn as one curve with error bars.
type Series struct {
	Name   string
	Points []Point
}

// ErrorPlotConfig describes a plot of one or more series with error bars:
// resolution or bias against energy, resolution against coverage,
// mis-identification against momentum.
type ErrorPlotConfig struct {
	// Title says what is plotted; Caption, if set, is a second title
	// line (the sample, a definition).
	Title, Caption, XLabel, YLabel string
	Series                         []Series
	// LogX draws the x axis logarithmically (all X must be positive),
	// with a labelled tick at each point's X.
	LogX bool
	// ZeroLine draws the line y = 0 (for biases).
	ZeroLine bool
	// YFromZero starts the y axis at zero (for resolutions and fractions).
	YFromZero bool
	// LimitNote, if set, is the legend entry explaining the arrows of
	// limit points (e.g. "arrows: 90% CL upper limits"); when empty and
	// there are limit points, a note naming the limits' kind is made.
	LimitNote string
}

// NewErrorPlot returns the plot of cfg. Points with non-finite values are
// an error naming the series and point.
func NewErrorPlot(cfg ErrorPlotConfig) (*plot.Plot, error) {
	if len(cfg.Series) == 0 {
		return nil, fmt.Errorf("display: ErrorPlotConfig.Series is empty")
	}
	p := plot.New()
	p.Title.Text = cfg.Title
	if cfg.Caption != "" {
		p.Title.Text += "\n" + cfg.Caption
	}
	p.X.Label.Text = cfg.XLabel
	p.Y.Label.Text = cfg.YLabel
	var xs []float64
	xmin, xmax, ytop, ybot := math.Inf(1), math.Inf(-1), math.Inf(-1), math.Inf(1)
	limits := map[resolution.Bound]bool{}
	for i, s := range cfg.Series {
		for j, q := range s.Points {
			if v := q.X + q.Y + q.Err + q.ErrLo + q.ErrHi; math.IsNaN(v) || math.IsInf(v, 0) || q.Err < 0 || q.ErrLo < 0 || q.ErrHi < 0 {
				return nil, fmt.Errorf("display: Series[%d] %q Points[%d] = %+v must be finite with non-negative errors", i, s.Name, j, q)
			}
			if q.Limit != resolution.Central && q.Limit != resolution.UpperLimit && q.Limit != resolution.LowerLimit {
				return nil, fmt.Errorf("display: Series[%d] %q Points[%d].Limit = %v is not a known bound", i, s.Name, j, q.Limit)
			}
			if cfg.LogX && !(q.X > 0) {
				return nil, fmt.Errorf("display: Series[%d] %q Points[%d].X = %g must be positive on a log axis", i, s.Name, j, q.X)
			}
			lo, hi := q.errors()
			xmin, xmax = math.Min(xmin, q.X), math.Max(xmax, q.X)
			ytop, ybot = math.Max(ytop, q.Y+hi), math.Min(ybot, q.Y-lo)
			xs = append(xs, q.X)
			if q.Limit != resolution.Central {
				limits[q.Limit] = true
			}
		}
		if err := addSeries(p, s, i, len(cfg.Series) > 1); err != nil {
			return nil, err
		}
	}
	if len(limits) > 0 {
		note := cfg.LimitNote
		if note == "" {
			note = "arrows: one-sided limits"
			switch {
			case limits[resolution.UpperLimit] && !limits[resolution.LowerLimit]:
				note = "arrows: upper limits"
			case limits[resolution.LowerLimit] && !limits[resolution.UpperLimit]:
				note = "arrows: lower limits"
			}
		}
		p.Legend.Add(note, limitThumb{})
	}
	if cfg.ZeroLine && xmax >= xmin {
		l, err := plotter.NewLine(plotter.XYs{{X: xmin, Y: 0}, {X: xmax, Y: 0}})
		if err != nil {
			return nil, err
		}
		l.LineStyle = draw.LineStyle{Color: wallLine, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}
		p.Add(l)
	}
	if cfg.YFromZero && ytop > 0 {
		// A limit arrow needs room below its bar (limitArrow long): keep
		// 12% of the range above the top point.
		p.Y.Min, p.Y.Max = 0, 1.12*ytop
	}
	// Room on both sides of the outer points.
	if xmax > xmin {
		if cfg.LogX {
			f := math.Pow(xmax/xmin, 0.05)
			p.X.Min, p.X.Max = xmin/f, xmax*f
		} else {
			m := 0.05 * (xmax - xmin)
			p.X.Min, p.X.Max = xmin-m, xmax+m
		}
	} else if cfg.LogX && xmax == xmin {
		p.X.Min, p.X.Max = xmin/1.5, xmax*1.5
	}
	tidyAxes(p)
	if cfg.LogX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = valueTicks(xs)
	}
	p.Add(plotter.NewGrid())
	return p, nil
}

type errXYs []Point

func (e errXYs) Len() int                    { return len(e) }
func (e errXYs) XY(i int) (float64, float64) { return e[i].X, e[i].Y }
func (e errXYs) YError(i int) (float64, float64) {
	return e[i].errors()
}

// limitArrow is the length of the arrow of a limit point.
const limitArrow = 12 * vg.Millimeter / 2

// limits draws the limit points of a series: a bar at Y and an arrow of
// length limitArrow towards the allowed side.
type limits struct {
	pts errXYs
	col color.Color
}

func (l limits) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	c.SetLineStyle(draw.LineStyle{Color: l.col, Width: vg.Points(1.2)})
	for _, q := range l.pts {
		if q.Limit == resolution.Central {
			continue
		}
		x, y := trX(q.X), trY(q.Y)
		dir := vg.Length(-1)
		if q.Limit == resolution.LowerLimit {
			dir = 1
		}
		drawLimit(c, x, y, dir, limitArrow, l.col)
	}
}

// drawLimit draws a limit bar at (x, y) with its arrow towards dir (-1
// down, +1 up).
func drawLimit(c draw.Canvas, x, y, dir, length vg.Length, col color.Color) {
	c.SetLineStyle(draw.LineStyle{Color: col, Width: vg.Points(1.2)})
	w := vg.Points(4)
	tip := y + dir*length
	var bar, shaft, head vg.Path
	bar.Move(vg.Point{X: x - w, Y: y})
	bar.Line(vg.Point{X: x + w, Y: y})
	shaft.Move(vg.Point{X: x, Y: y})
	shaft.Line(vg.Point{X: x, Y: tip})
	head.Move(vg.Point{X: x - w*0.8, Y: tip - dir*w*1.2})
	head.Line(vg.Point{X: x, Y: tip})
	head.Line(vg.Point{X: x + w*0.8, Y: tip - dir*w*1.2})
	head.Close()
	c.Stroke(bar)
	c.Stroke(shaft)
	c.SetColor(col)
	c.Fill(head)
}

// GlyphBoxes keeps the arrows inside the data area.
func (l limits) GlyphBoxes(p *plot.Plot) []plot.GlyphBox {
	var bs []plot.GlyphBox
	for _, q := range l.pts {
		if q.Limit == resolution.Central {
			continue
		}
		r := vg.Rectangle{Min: vg.Point{X: -vg.Points(4), Y: -limitArrow}, Max: vg.Point{X: vg.Points(4), Y: 0}}
		if q.Limit == resolution.LowerLimit {
			r = vg.Rectangle{Min: vg.Point{X: -vg.Points(4)}, Max: vg.Point{X: vg.Points(4), Y: limitArrow}}
		}
		bs = append(bs, plot.GlyphBox{X: p.X.Norm(q.X), Y: p.Y.Norm(q.Y), Rectangle: r})
	}
	return bs
}

// colourThumb is the legend icon of a series of limits only: a short
// line in its colour.
type colourThumb struct{ col color.Color }

func (t colourThumb) Thumbnail(c *draw.Canvas) {
	y := (c.Min.Y + c.Max.Y) / 2
	var l vg.Path
	l.Move(vg.Point{X: c.Min.X, Y: y})
	l.Line(vg.Point{X: c.Max.X, Y: y})
	c.SetLineStyle(draw.LineStyle{Color: t.col, Width: vg.Points(1.2)})
	c.Stroke(l)
}

// limitThumb is the legend icon of the limit note: a small down arrow.
type limitThumb struct{}

func (limitThumb) Thumbnail(c *draw.Canvas) {
	x := (c.Min.X + c.Max.X) / 2
	drawLimit(*c, x, c.Max.Y, -1, c.Max.Y-c.Min.Y, ringColour)
}

// addSeries adds the points of s with error bars and a joining line in the
// i-th series colour, with a legend entry when legend is set. Limit
// points get a bar and an arrow instead of a marker.
func addSeries(p *plot.Plot, s Series, i int, legend bool) error {
	if len(s.Points) == 0 {
		return nil
	}
	col := seriesColour(i)
	pts := errXYs(s.Points)
	var measured errXYs
	for _, q := range pts {
		if q.Limit == resolution.Central {
			measured = append(measured, q)
		}
	}
	shapes := []draw.GlyphDrawer{draw.CircleGlyph{}, draw.BoxGlyph{}, draw.TriangleGlyph{}, draw.PyramidGlyph{}, draw.RingGlyph{}, draw.SquareGlyph{}}
	glyph := draw.GlyphStyle{Color: col, Radius: vg.Points(2.6), Shape: shapes[i%len(shapes)]}
	var thumbs []plot.Thumbnailer
	if len(measured) > 0 {
		// The line joins the measured points only: a limit is not a value.
		line, err := plotter.NewLine(measured)
		if err != nil {
			return err
		}
		line.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
		p.Add(line)
		thumbs = append(thumbs, line)
		sc, err := plotter.NewScatter(measured)
		if err != nil {
			return err
		}
		sc.GlyphStyle = glyph
		eb, err := plotter.NewYErrorBars(measured)
		if err != nil {
			return err
		}
		eb.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
		eb.CapWidth = vg.Points(5)
		p.Add(eb, sc)
		thumbs = append(thumbs, sc)
	}
	if len(measured) < len(pts) {
		p.Add(limits{pts: pts, col: col})
		if len(measured) == 0 {
			thumbs = append(thumbs, colourThumb{col})
		}
	}
	if legend || s.Name != "" {
		p.Legend.Add(s.Name, thumbs...)
	}
	return nil
}

// PullConfig describes a pull histogram.
type PullConfig struct {
	Title, XLabel string
	// Pulls are the values (fit - truth) / uncertainty; non-finite ones
	// are left out and counted in the legend.
	Pulls []float64
	// Range is the half-width of the histogram; 0 means 5. Bins: 0 means 40.
	Range float64
	Bins  int
}

// NewPullPlot returns the histogram of the pulls with the Gaussian core
// fit of resolution.GaussianCore (at 2.5 sigma) drawn over it, scaled to the
// core count, and the legend giving its mean and width with their errors.
// A well-estimated uncertainty gives mean 0 and width 1.
func NewPullPlot(cfg PullConfig) (*plot.Plot, error) {
	r, bins := cfg.Range, cfg.Bins
	if r == 0 {
		r = 5
	}
	if bins == 0 {
		bins = 40
	}
	if !(r > 0) || math.IsInf(r, 0) || bins < 2 || bins > 10000 {
		return nil, fmt.Errorf("display: PullConfig.Range = %g, Bins = %d: need a positive finite range and 2..10000 bins", r, bins)
	}
	var x []float64
	for _, v := range cfg.Pulls {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			x = append(x, v)
		}
	}
	if len(x) < 5 { // the fewest resolution.GaussianCore accepts
		return nil, fmt.Errorf("display: PullConfig.Pulls has %d finite values, need at least 5", len(x))
	}
	g, err := resolution.GaussianCore(x, 2.5)
	if err != nil {
		return nil, err
	}
	h, under, over := histogram(x, -r, r, bins)
	p := plot.New()
	p.Title.Text = cfg.Title
	p.X.Label.Text = cfg.XLabel
	w := 2 * r / float64(bins)
	p.Y.Label.Text = "events / " + formatTick(w, decimals([]float64{w}))
	bar, err := newBars(h, -r, r)
	if err != nil {
		return nil, err
	}
	p.Add(bar)
	p.Legend.Add(fmt.Sprintf("%d events (%d not finite, %d outside ±%s in grey bins)", len(x), len(cfg.Pulls)-len(x), under+over, formatTick(r, decimals([]float64{r}))), bar)
	// The core holds the fraction 2 Phi(2.5) - 1 of a normal sample: scale
	// the density so that its area equals Core / that fraction.
	norm := float64(g.Core) / math.Erf(2.5/math.Sqrt2) * w
	mu, sg := g.Mean.Value, g.Sigma.Value
	f := plotter.NewFunction(func(t float64) float64 {
		z := (t - mu) / sg
		return norm / (sg * math.Sqrt(2*math.Pi)) * math.Exp(-z*z/2)
	})
	f.XMin, f.XMax, f.Samples = -r, r, 400
	f.LineStyle = draw.LineStyle{Color: fitColour, Width: vg.Points(1.5)}
	p.Add(f)
	p.Legend.Add(fmt.Sprintf("Gaussian core: mean %.2f ± %.2f, σ %.2f ± %.2f", mu, g.Mean.Err, sg, g.Sigma.Err), f)
	top := 0.0
	for _, c := range h {
		top = math.Max(top, c)
	}
	addFlow(p, -r, r, bins, under, over, "")
	top = math.Max(top, float64(max(under, over)))
	p.Y.Min, p.Y.Max = 0, 1.15*math.Max(top, norm/(sg*math.Sqrt(2*math.Pi)))
	return p, nil
}

// Grid is a figure of plots in rows and columns (row-major, nil for an
// empty cell), aligned so that their data areas have the same size. Each
// plot's legend is drawn in a band between its title and its data area,
// never on the data: the band is as tall as the tallest legend of the row,
// so the data areas of a row stay aligned.
type Grid struct {
	Rows, Cols int
	Plots      []*plot.Plot
}

// legendGap is the space between a legend band and what is next to it.
const legendGap = 3 * vg.Millimeter

// legendHeight returns the height of l's entries, 0 for none.
func legendHeight(l *plot.Legend, c draw.Canvas) vg.Length {
	r := l.Rectangle(c)
	h := r.Max.Y - r.Min.Y
	if h <= 0 {
		return 0
	}
	return h + l.TextStyle.FontExtents().Descent
}

// withoutLegend returns a copy of p that draws no legend.
func withoutLegend(p *plot.Plot) *plot.Plot {
	q := *p
	q.Legend = plot.NewLegend()
	return &q
}

// Draw draws the grid on c.
func (g Grid) Draw(c draw.Canvas) {
	if g.Rows <= 0 || g.Cols <= 0 {
		return
	}
	ps := make([][]*plot.Plot, g.Rows)
	qs := make([][]*plot.Plot, g.Rows)
	band := make([]vg.Length, g.Rows)
	for i := range ps {
		ps[i] = make([]*plot.Plot, g.Cols)
		qs[i] = make([]*plot.Plot, g.Cols)
		for j := range ps[i] {
			if k := i*g.Cols + j; k < len(g.Plots) && g.Plots[k] != nil {
				ps[i][j] = g.Plots[k]
				band[i] = max(band[i], legendHeight(&ps[i][j].Legend, c))
			}
		}
		for j, p := range ps[i] {
			if p == nil {
				continue
			}
			q := withoutLegend(p)
			if band[i] > 0 {
				if q.Title.Text == "" {
					q.Title.Text = " "
				}
				q.Title.Padding += band[i] + legendGap
			}
			qs[i][j] = q
		}
	}
	t := draw.Tiles{Rows: g.Rows, Cols: g.Cols, PadX: vg.Millimeter * 6, PadY: vg.Millimeter * 6,
		PadTop: vg.Millimeter * 2, PadBottom: vg.Millimeter * 2, PadLeft: vg.Millimeter * 2, PadRight: vg.Millimeter * 2}
	cs := plot.Align(qs, t, c)
	for i := range qs {
		for j, q := range qs[i] {
			if q == nil {
				continue
			}
			q.Draw(cs[i][j])
			if band[i] == 0 {
				continue
			}
			// The band under the title, over the width of the data area.
			p := ps[i][j]
			dc := q.DataCanvas(cs[i][j])
			top := cs[i][j].Max.Y - p.Title.TextStyle.Rectangle(q.Title.Text).Size().Y - p.Title.Padding
			l := p.Legend
			l.Top, l.Left, l.XOffs, l.YOffs = true, true, 0, 0
			l.Draw(draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
				Min: vg.Point{X: dc.Min.X, Y: top - band[i]}, Max: vg.Point{X: dc.Max.X, Y: top}}})
		}
	}
}
