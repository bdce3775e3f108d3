package display

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/conelight/conelight/fit/resolution"
)

// Point is one measurement of a study: at X, the value Y with its 1-sigma
// statistical error Err.
type Point struct {
	X, Y, Err float64
}

// PointOf returns the point at x of a resolution estimate.
func PointOf(x float64, e resolution.Estimate) Point { return Point{X: x, Y: e.Value, Err: e.Err} }

// Series is a named set of points drawn as one curve with error bars.
type Series struct {
	Name   string
	Points []Point
}

// ErrorPlotConfig describes a plot of one or more series with error bars:
// resolution or bias against energy, resolution against coverage,
// mis-identification against momentum.
type ErrorPlotConfig struct {
	Title, XLabel, YLabel string
	Series                []Series
	// LogX draws the x axis logarithmically (all X must be positive).
	LogX bool
	// ZeroLine draws the line y = 0 (for biases).
	ZeroLine bool
	// YFromZero starts the y axis at zero (for resolutions and fractions).
	YFromZero bool
}

// NewErrorPlot returns the plot of cfg. Points with non-finite values are
// an error naming the series and point.
func NewErrorPlot(cfg ErrorPlotConfig) (*plot.Plot, error) {
	if len(cfg.Series) == 0 {
		return nil, fmt.Errorf("display: ErrorPlotConfig.Series is empty")
	}
	p := plot.New()
	p.Title.Text = cfg.Title
	p.X.Label.Text = cfg.XLabel
	p.Y.Label.Text = cfg.YLabel
	if cfg.LogX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	}
	xmin, xmax, ytop := math.Inf(1), math.Inf(-1), 0.0
	for i, s := range cfg.Series {
		for j, q := range s.Points {
			if math.IsNaN(q.X+q.Y+q.Err) || math.IsInf(q.X+q.Y+q.Err, 0) || q.Err < 0 {
				return nil, fmt.Errorf("display: Series[%d] %q Points[%d] = %+v must be finite with a non-negative error", i, s.Name, j, q)
			}
			if cfg.LogX && !(q.X > 0) {
				return nil, fmt.Errorf("display: Series[%d] %q Points[%d].X = %g must be positive on a log axis", i, s.Name, j, q.X)
			}
			xmin, xmax, ytop = math.Min(xmin, q.X), math.Max(xmax, q.X), math.Max(ytop, q.Y+q.Err)
		}
		if err := addSeries(p, s, i, len(cfg.Series) > 1); err != nil {
			return nil, err
		}
	}
	if cfg.ZeroLine && xmax >= xmin {
		l, err := plotter.NewLine(plotter.XYs{{X: xmin, Y: 0}, {X: xmax, Y: 0}})
		if err != nil {
			return nil, err
		}
		l.LineStyle = draw.LineStyle{Color: wallLine, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}
		p.Add(l)
	}
	if cfg.YFromZero {
		// Head room above the points for the legend.
		p.Y.Min, p.Y.Max = 0, 1.35*ytop
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
	}
	p.Legend.Top = true
	p.Add(plotter.NewGrid())
	return p, nil
}

type errXYs []Point

func (e errXYs) Len() int                        { return len(e) }
func (e errXYs) XY(i int) (float64, float64)     { return e[i].X, e[i].Y }
func (e errXYs) YError(i int) (float64, float64) { return e[i].Err, e[i].Err }

// addSeries adds the points of s with error bars and a joining line in the
// i-th series colour, with a legend entry when legend is set.
func addSeries(p *plot.Plot, s Series, i int, legend bool) error {
	if len(s.Points) == 0 {
		return nil
	}
	col := seriesColour(i)
	pts := errXYs(s.Points)
	line, sc, err := plotter.NewLinePoints(pts)
	if err != nil {
		return err
	}
	line.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
	shapes := []draw.GlyphDrawer{draw.CircleGlyph{}, draw.BoxGlyph{}, draw.TriangleGlyph{}, draw.PyramidGlyph{}, draw.RingGlyph{}, draw.SquareGlyph{}}
	sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.6), Shape: shapes[i%len(shapes)]}
	eb, err := plotter.NewYErrorBars(pts)
	if err != nil {
		return err
	}
	eb.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
	eb.CapWidth = vg.Points(5)
	p.Add(line, eb, sc)
	if legend || s.Name != "" {
		p.Legend.Add(s.Name, line, sc)
	}
	return nil
}

// Fraction returns k/n with the 1-sigma half-width of the Wilson score
// interval as its error (Wilson, J. Am. Stat. Assoc. 22 (1927) 209), which
// stays positive at k = 0 and k = n, where the normal approximation
// sqrt(p(1-p)/n) vanishes.
func Fraction(k, n int) (resolution.Estimate, error) {
	if n <= 0 || k < 0 || k > n {
		return resolution.Estimate{}, fmt.Errorf("display: fraction %d of %d: need 0 <= k <= n, n > 0", k, n)
	}
	p, fn := float64(k)/float64(n), float64(n)
	half := math.Sqrt(p*(1-p)/fn+1/(4*fn*fn)) / (1 + 1/fn)
	return resolution.Estimate{Value: p, Err: half}, nil
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
	h := histogram(x, -r, r, bins)
	p := plot.New()
	p.Title.Text = cfg.Title
	p.X.Label.Text = cfg.XLabel
	w := 2 * r / float64(bins)
	p.Y.Label.Text = fmt.Sprintf("events / %.3g", w)
	bar, err := newBars(h, -r, r)
	if err != nil {
		return nil, err
	}
	p.Add(bar)
	p.Legend.Add(fmt.Sprintf("%d events (%d not finite)", len(x), len(cfg.Pulls)-len(x)), bar)
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
	p.Legend.Top = true
	p.Legend.TextStyle.Font.Size = vg.Points(8)
	top := 0.0
	for _, c := range h {
		top = math.Max(top, c)
	}
	p.X.Min, p.X.Max = -r, r
	p.Y.Min, p.Y.Max = 0, 1.3*math.Max(top, norm/(sg*math.Sqrt(2*math.Pi)))
	return p, nil
}

// Grid is a figure of plots in rows and columns (row-major, nil for an
// empty cell), aligned so that their data areas have the same size.
type Grid struct {
	Rows, Cols int
	Plots      []*plot.Plot
}

// Draw draws the grid on c.
func (g Grid) Draw(c draw.Canvas) {
	if g.Rows <= 0 || g.Cols <= 0 {
		return
	}
	ps := make([][]*plot.Plot, g.Rows)
	for i := range ps {
		ps[i] = make([]*plot.Plot, g.Cols)
		for j := range ps[i] {
			if k := i*g.Cols + j; k < len(g.Plots) {
				ps[i][j] = g.Plots[k]
			}
		}
	}
	t := draw.Tiles{Rows: g.Rows, Cols: g.Cols, PadX: vg.Millimeter * 6, PadY: vg.Millimeter * 6,
		PadTop: vg.Millimeter * 2, PadBottom: vg.Millimeter * 2, PadLeft: vg.Millimeter * 2, PadRight: vg.Millimeter * 2}
	cs := plot.Align(ps, t, c)
	for i := range ps {
		for j, p := range ps[i] {
			if p != nil {
				p.Draw(cs[i][j])
			}
		}
	}
}
