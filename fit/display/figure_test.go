package display

import (
	"bytes"
	"encoding/xml"
	"image/color"
	"image/png"
	"io"
	"math"
	"math/rand/v2"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/pmt"
)

// svgText is one text element of an SVG figure: its position (points,
// y up as on the canvas) and content.
type svgText struct {
	x, y float64
	s    string
}

// svgTexts draws f as SVG and returns its text elements.
func svgTexts(t *testing.T, f Figure, w, h vg.Length) []svgText {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(&buf, f, w, h, SVG); err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(&buf)
	var out []svgText
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		se, ok := tok.(xml.StartElement)
		if !ok || se.Name.Local != "text" {
			continue
		}
		var e svgText
		for _, a := range se.Attr {
			switch a.Name.Local {
			case "x":
				e.x, _ = strconv.ParseFloat(a.Value, 64)
			case "y":
				e.y, _ = strconv.ParseFloat(a.Value, 64)
				e.y = -e.y // written under scale(1, -1)
			}
		}
		var s string
		if err := dec.DecodeElement(&s, &se); err != nil {
			t.Fatal(err)
		}
		e.s = s
		out = append(out, e)
	}
	return out
}

func findText(ts []svgText, sub string) (svgText, bool) {
	for _, e := range ts {
		if strings.Contains(e.s, sub) {
			return e, true
		}
	}
	return svgText{}, false
}

var number = regexp.MustCompile(`^-?[0-9]+(\.[0-9]+)?$`)

// numbers returns the texts that are plain numbers (tick labels).
func numbers(ts []svgText) []svgText {
	var out []svgText
	for _, e := range ts {
		if number.MatchString(e.s) {
			out = append(out, e)
		}
	}
	return out
}

// decimalsOf returns the number of decimals written in a number label.
func decimalsOf(s string) int {
	if i := strings.IndexByte(s, '.'); i >= 0 {
		return len(s) - i - 1
	}
	return 0
}

func TestTidyTicks(t *testing.T) {
	// gonum's default labels 0..55 "0.00, 25.00, 50.00" (steps of 2.5
	// units of the decade): the tidy ones are integers.
	for _, c := range []struct {
		min, max float64
		want     int
	}{{0, 55, 0}, {0, 1.6, 1}, {-5, 5, 0}, {0, 0.35, 1}, {1000, 3400, 0}} {
		ts := tidyTicks{plot.DefaultTicks{}}.Ticks(c.min, c.max)
		n := 0
		for _, tk := range ts {
			if tk.Label == "" {
				continue
			}
			n++
			if d := decimalsOf(tk.Label); d != c.want {
				t.Errorf("[%g, %g]: label %q has %d decimals, want %d", c.min, c.max, tk.Label, d, c.want)
			}
			if v, err := strconv.ParseFloat(tk.Label, 64); err != nil || math.Abs(v-tk.Value) > 1e-9*math.Max(1, math.Abs(tk.Value)) {
				t.Errorf("label %q for tick %g", tk.Label, tk.Value)
			}
		}
		if n < 2 {
			t.Errorf("[%g, %g]: %d labels", c.min, c.max, n)
		}
	}
}

// Every axis of a study figure is labelled alike: within one axis the
// same number of decimals, and no ".00" on a whole number.
func TestFigureTickLabels(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	pulls := make([]float64, 300)
	for i := range pulls {
		pulls[i] = rng.NormFloat64()
	}
	pull, err := NewPullPlot(PullConfig{Title: "pull", Pulls: pulls})
	if err != nil {
		t.Fatal(err)
	}
	res, err := NewErrorPlot(ErrorPlotConfig{Title: "vertex", YLabel: "cm", XLabel: "MeV", YFromZero: true, LogX: true, Series: []Series{
		{Name: "a", Points: []Point{{X: 20, Y: 44, Err: 3}, {X: 200, Y: 21, Err: 2}, {X: 800, Y: 17, Err: 2}}}}})
	if err != nil {
		t.Fatal(err)
	}
	ts := svgTexts(t, Grid{Rows: 1, Cols: 2, Plots: []*plot.Plot{pull, res}}, 10*vg.Inch, 4*vg.Inch)
	nums := numbers(ts)
	if len(nums) < 10 {
		t.Fatalf("%d tick labels: %v", len(nums), ts)
	}
	for _, e := range nums {
		if v, _ := strconv.ParseFloat(e.s, 64); v == math.Trunc(v) && strings.Contains(e.s, ".") {
			t.Errorf("whole number written %q", e.s)
		}
	}
}

// A log energy axis carries a label at each point's energy.
func TestLogAxisLabelsEnergies(t *testing.T) {
	p, err := NewErrorPlot(ErrorPlotConfig{Title: "t", LogX: true, Series: []Series{
		{Name: "e-", Points: []Point{{X: 20, Y: 1, Err: 0.1}, {X: 200, Y: 2, Err: 0.1}}},
		{Name: "mu-", Points: []Point{{X: 300, Y: 1, Err: 0.1}, {X: 800, Y: 2, Err: 0.1}}}}})
	if err != nil {
		t.Fatal(err)
	}
	ts := svgTexts(t, p, 6*vg.Inch, 4*vg.Inch)
	for _, e := range []string{"20", "200", "300", "800"} {
		found := false
		for _, x := range ts {
			found = found || x.s == e
		}
		if !found {
			t.Errorf("no tick label %q on the energy axis", e)
		}
	}
}

// The legend of a study plot sits in its own band between the title and
// the data: above every tick label, below the title.
func TestLegendOffData(t *testing.T) {
	p, err := NewErrorPlot(ErrorPlotConfig{Title: "resolution", YFromZero: true, Series: []Series{
		{Name: "first series", Points: []Point{{X: 0, Y: 10, Err: 1}, {X: 1, Y: 50, Err: 1}}},
		{Name: "second series", Points: []Point{{X: 0, Y: 49, Err: 1}, {X: 1, Y: 10, Err: 1}}}}})
	if err != nil {
		t.Fatal(err)
	}
	ts := svgTexts(t, p, 6*vg.Inch, 4*vg.Inch)
	title, _ := findText(ts, "resolution")
	top := math.Inf(-1)
	for _, e := range numbers(ts) {
		top = math.Max(top, e.y)
	}
	for _, name := range []string{"first series", "second series"} {
		l, ok := findText(ts, name)
		if !ok {
			t.Fatalf("no legend entry %q", name)
		}
		// 8 points: a label's height, so the band clears the top label.
		if !(l.y > top+8 && l.y < title.y) {
			t.Errorf("legend %q at y = %.1f: want above the top tick label (%.1f) and below the title (%.1f)", name, l.y, top, title.y)
		}
	}
}

// The event display marks the clamped ends of its time scale ("≥", "≤"
// labels and a legend line counting the hits drawn in the end colours),
// and its legend lies below the tank, off the data.
func TestEventClampMarked(t *testing.T) {
	d := demoDetector(t)
	rng := rand.New(rand.NewPCG(9, 10))
	tr := Track{Vertex: r3.Vector{X: -60, Y: 10, Z: 40}, Dir: r3.Vector{Z: -1}, CosCherenkov: 0.75, Label: "fit"}
	hits := ringHits(d, tr, rng)
	for i := range hits {
		hits[i].Time += 20 * rng.ExpFloat64() // a late tail beyond the 75% quantile
	}
	e, err := NewEventDisplay(EventConfig{Detector: d, Hits: hits, Track: &tr, Title: "clamp"})
	if err != nil {
		t.Fatal(err)
	}
	above, below := 0, 0
	for _, h := range hits {
		if h.Time > e.Scale.Max {
			above++
		}
		if h.Time < e.Scale.Min {
			below++
		}
	}
	if above != e.Scale.Above || below != e.Scale.Below || above < len(hits)/5 {
		t.Errorf("scale %+v, counted %d above and %d below of %d", e.Scale, above, below, len(hits))
	}
	ts := svgTexts(t, e, 8*vg.Inch, 7.5*vg.Inch)
	if _, ok := findText(ts, "≥ "+formatTick(e.Scale.Max, decimals([]float64{e.Scale.Min, e.Scale.Max}))); !ok {
		t.Errorf("no ≥ label at the top of the scale %+v", e.Scale)
	}
	if _, ok := findText(ts, strconv.Itoa(above)+" hits with hit time ≥"); !ok {
		t.Error("no legend line counting the clamped hits")
	}
	l, ok1 := findText(ts, "hits (marker size")
	x, ok2 := findText(ts, "barrel: arc length")
	if !ok1 || !ok2 || !(l.y < x.y) {
		t.Errorf("legend at y = %.1f, not below the x axis label at %.1f", l.y, x.y)
	}
	// Without hits beyond the ends there is no clamp mark.
	for i := range hits {
		hits[i].Time = 10
	}
	e, err = NewEventDisplay(EventConfig{Detector: d, Hits: hits, ColorBy: ByTime})
	if err != nil {
		t.Fatal(err)
	}
	if e.Scale.Above != 0 || e.Scale.Below != 0 {
		t.Errorf("equal times clamped: %+v", e.Scale)
	}
	for _, x := range svgTexts(t, e, 8*vg.Inch, 7.5*vg.Inch) {
		if strings.HasPrefix(x.s, "≥") || strings.HasPrefix(x.s, "≤") {
			t.Errorf("clamp label %q without clamped hits", x.s)
		}
	}
}

// Residuals outside the range go to underflow and overflow bins drawn
// apart and labelled, not into the first and last bin; the caption
// defines t0, v and v_g.
func TestResidualFlowBins(t *testing.T) {
	h, under, over := histogram([]float64{-50, -30, 0, 89.9, 90, 200, math.Nextafter(90, 0)}, -30, 90, 60)
	if under != 1 || over != 2 || h[0] != 1 || h[59] != 2 {
		t.Errorf("under %d, over %d, first bin %g, last bin %g; want 1, 2, 1, 2", under, over, h[0], h[59])
	}
	d := demoDetector(t)
	v := r3.Vector{X: 30}
	var hits []pmt.Hit
	for i, dt := range []float64{-40, -35, 5, 6, 7, 95, 120, 300} {
		s := d.Sensor(100 * i)
		hits = append(hits, pmt.Hit{Sensor: s.Index, Time: s.Pos.Sub(v).Norm()/21.8 + dt, Charge: 1})
	}
	p, err := NewResidualPlot(ResidualConfig{Detector: d, Hits: hits, Vertex: v, GroupVelocity: 21.8, Title: "flow"})
	if err != nil {
		t.Fatal(err)
	}
	ts := svgTexts(t, p, 6*vg.Inch, 4*vg.Inch)
	for _, want := range []string{"underflow", "< -30 ns", "overflow", "≥ 90 ns", "v_g = 21.8 cm/ns", "t0, v: fitted time, vertex", "8 hits, 5 of them outside -30 to 90 ns"} {
		if _, ok := findText(ts, want); !ok {
			t.Errorf("no text %q in the residual plot", want)
		}
	}
	u, _ := findText(ts, "underflow")
	o, _ := findText(ts, "overflow")
	// The x tick labels: the numbers on the lowest baseline.
	axis := numbers(ts)
	base := math.Inf(1)
	for _, n := range axis {
		base = math.Min(base, n.y)
	}
	minX, maxX := math.Inf(1), math.Inf(-1)
	for _, n := range axis {
		if n.y < base+1 {
			minX, maxX = math.Min(minX, n.x), math.Max(maxX, n.x)
		}
	}
	if !(u.x < minX && o.x > maxX) {
		t.Errorf("flow labels at x = %.1f, %.1f: want outside the labelled range %.1f..%.1f", u.x, o.x, minX, maxX)
	}
}

// A proportion with no events is drawn as an upper limit: a bar with an
// arrow down, reaching further below its value than the marker of a
// measured point, and the legend names the arrows.
func TestLimitArrow(t *testing.T) {
	zero, err := resolution.Proportion(0, 16)
	if err != nil {
		t.Fatal(err)
	}
	extent := func(q Point) (int, []svgText) {
		p, err := NewErrorPlot(ErrorPlotConfig{Title: "mis-id", YFromZero: true, Series: []Series{
			{Name: "e-", Points: []Point{{X: 1, Y: 30, Err: 3}, {X: 2, Y: 25, Err: 3}}},
			{Name: "mu-", Points: []Point{q}}}})
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := Write(&buf, p, 6*vg.Inch, 4*vg.Inch, PNG); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatal(err)
		}
		// Rows holding the second series' colour.
		want := color.RGBAModel.Convert(seriesColour(1)).(color.RGBA)
		lo, hi := math.MaxInt, -1
		b := img.Bounds()
		for y := b.Min.Y; y < b.Max.Y; y++ {
			for x := b.Min.X; x < b.Max.X; x++ {
				if c := color.RGBAModel.Convert(img.At(x, y)).(color.RGBA); c == want {
					lo, hi = min(lo, y), max(hi, y)
				}
			}
		}
		return hi - lo, svgTexts(t, p, 6*vg.Inch, 4*vg.Inch)
	}
	limit, ts := extent(PointOfProportion(1.5, zero, 100))
	marker, _ := extent(Point{X: 1.5, Y: 100 * zero.Hi})
	// The arrow is limitArrow = 6 mm long: 35 pixels at PNGDPI.
	if px := int(math.Round(float64(limitArrow/vg.Inch) * PNGDPI)); limit < marker+px-4 {
		t.Errorf("limit drawn %d pixels tall, marker %d: want an arrow of about %d more", limit, marker, px)
	}
	if _, ok := findText(ts, "arrows: upper limits"); !ok {
		t.Error("no legend entry for the limit arrows")
	}
	if q := PointOfProportion(1, zero, 100); q.Limit != resolution.UpperLimit || math.Abs(q.Y-100*(1-math.Pow(0.1, 1.0/16))) > 1e-9 {
		t.Errorf("0/16 point %+v, want the 90%% CL upper limit", q)
	}
}
