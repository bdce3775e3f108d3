package display

import (
	"bytes"
	"encoding/xml"
	"image/png"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

func demoDetector(t testing.TB) *geom.Detector {
	t.Helper()
	d, err := geom.Layout(geom.DemoTank(), pmt.Medium().CathodeDiameter, 0.2)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// ringHits returns hits on the sensors within 3 degrees of the cone of tr,
// with times of direct light from the vertex at 21.8 cm/ns.
func ringHits(d *geom.Detector, tr Track, rng *rand.Rand) []pmt.Hit {
	var hits []pmt.Hit
	for _, s := range d.Sensors() {
		r := s.Pos.Sub(tr.Vertex)
		c := r.Dot(tr.Dir) / r.Norm()
		if math.Abs(math.Acos(c)-math.Acos(tr.CosCherenkov)) < 3*math.Pi/180 || rng.Float64() < 0.01 {
			hits = append(hits, pmt.Hit{Sensor: s.Index, Time: r.Norm() / 21.8, Charge: 0.5 + 4*rng.Float64()})
		}
	}
	return hits
}

func TestRingTopCapCircle(t *testing.T) {
	// A cone along +z from the centre meets the top cap in a circle of
	// radius H tan(theta) about the cap centre (closed form).
	d := demoDetector(t)
	tr := Track{Dir: r3.Vector{Z: 1}, CosCherenkov: 0.9}
	ring, err := RingPolylines(d, tr, 360)
	if err != nil {
		t.Fatal(err)
	}
	u := NewUnrolled(d.Tank())
	want := u.H * math.Tan(math.Acos(0.9))
	if len(ring) != 1 || len(ring[0]) != 361 {
		t.Fatalf("ring pieces %d, want one closed polyline of 361 points", len(ring))
	}
	for _, p := range ring[0] {
		if r := math.Hypot(p.X, p.Y-u.TopCentre()); math.Abs(r-want) > 1e-6 {
			t.Fatalf("ring point at radius %g, want %g", r, want)
		}
	}
}

func TestRingBarrel(t *testing.T) {
	// A cone along +x from the centre: a barrel point (R cos phi, R sin phi, z)
	// is on it when R cos phi / sqrt(R^2 + z^2) = cos theta (closed form).
	d := demoDetector(t)
	const c = 0.75
	ring, err := RingPolylines(d, Track{Dir: r3.Vector{X: 1}, CosCherenkov: c}, 720)
	if err != nil {
		t.Fatal(err)
	}
	u := NewUnrolled(d.Tank())
	n := 0
	for _, pl := range ring {
		for _, p := range pl {
			phi := p.X / u.R
			if got := u.R * math.Cos(phi) / math.Hypot(u.R, p.Y); math.Abs(got-c) > 1e-9 {
				t.Fatalf("point %v: cos %g, want %g", p, got, c)
			}
			n++
		}
	}
	if n < 700 {
		t.Errorf("%d ring points, want 721", n)
	}
}

func TestRingSplitAtSurfaces(t *testing.T) {
	// A cone reaching the barrel and the top cap is cut into pieces, and no
	// piece has a jump longer than the arc between two rays could be.
	d := demoDetector(t)
	tr := Track{Vertex: r3.Vector{X: 100, Z: 200}, Dir: r3.Vector{X: 0.6, Z: 0.8}, CosCherenkov: 0.75}
	ring, err := RingPolylines(d, tr, 1440)
	if err != nil {
		t.Fatal(err)
	}
	if len(ring) < 2 {
		t.Fatalf("%d pieces, want the ring cut between barrel and cap", len(ring))
	}
	for _, pl := range ring {
		for i := 1; i < len(pl); i++ {
			// 2 pi / 1440 of a cone of slant length < 2000 cm: < 10 cm.
			if dd := math.Hypot(pl[i].X-pl[i-1].X, pl[i].Y-pl[i-1].Y); dd > 10 {
				t.Fatalf("jump of %g cm inside a piece", dd)
			}
		}
	}
}

func TestResiduals(t *testing.T) {
	// Hits made at t0 + distance/v + k have residual k (definition).
	d := demoDetector(t)
	v := r3.Vector{X: 50, Y: -30, Z: 10}
	hits := []pmt.Hit{{Sensor: 3}, {Sensor: 400}, {Sensor: 1500}}
	for i := range hits {
		hits[i].Time = 7 + d.Sensor(hits[i].Sensor).Pos.Sub(v).Norm()/22 + float64(i)
		hits[i].Charge = 1
	}
	res, err := Residuals(d, hits, v, 7, 22)
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range res {
		if math.Abs(r-float64(i)) > 1e-9 {
			t.Errorf("residual %d = %g, want %d", i, r, i)
		}
	}
	if _, err := Residuals(d, []pmt.Hit{{Sensor: -1}}, v, 0, 22); err == nil || !strings.Contains(err.Error(), "Sensor = -1") {
		t.Errorf("bad sensor: %v", err)
	}
	if _, err := Residuals(d, hits, v, math.NaN(), 22); err == nil {
		t.Error("NaN time accepted")
	}
	if _, err := Residuals(d, hits, v, 0, 0); err == nil {
		t.Error("zero group velocity accepted")
	}
}

func TestChargeProfile(t *testing.T) {
	// Brute force: every sensor in exactly one bin, charges summed per bin
	// equal to the total, and one bin's mean recomputed by hand.
	d := demoDetector(t)
	rng := rand.New(rand.NewPCG(1, 2))
	tr := Track{Vertex: r3.Vector{X: -40, Z: 30}, Dir: r3.Vector{Y: 1}, CosCherenkov: 0.75}
	hits := ringHits(d, tr, rng)
	prof, err := ChargeProfile(d, hits, tr.Vertex, tr.Dir, 36)
	if err != nil {
		t.Fatal(err)
	}
	var ns int
	var q, total float64
	for _, b := range prof {
		ns += b.Sensors
		q += b.Charge
	}
	for _, h := range hits {
		total += h.Charge
	}
	if ns != d.NumSensors() || math.Abs(q-total) > 1e-9*total {
		t.Errorf("profile holds %d sensors, %g pe; want %d, %g", ns, q, d.NumSensors(), total)
	}
	// The Cherenkov bin (41.4 deg: bin 8 of 5-degree bins) has the most light.
	best := 0
	for i, b := range prof {
		if b.Mean > prof[best].Mean {
			best = i
		}
	}
	if a := math.Acos(0.75) * 180 / math.Pi; a < prof[best].Lo-5 || a > prof[best].Hi+5 {
		t.Errorf("brightest bin [%g, %g), Cherenkov angle %g", prof[best].Lo, prof[best].Hi, a)
	}
	if _, err := ChargeProfile(d, hits, tr.Vertex, r3.Vector{X: 2}, 36); err == nil {
		t.Error("non-unit direction accepted")
	}
}

// checkPNG decodes a PNG, checks its size and that it is not blank.
func checkPNG(t *testing.T, r io.Reader, width, height vg.Length, minColours int) {
	t.Helper()
	img, err := png.Decode(r)
	if err != nil {
		t.Fatal(err)
	}
	w, h := PixelSize(width, height)
	if b := img.Bounds(); b.Dx() != w || b.Dy() != h {
		t.Fatalf("PNG is %dx%d, want %dx%d", b.Dx(), b.Dy(), w, h)
	}
	colours := map[[4]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, a := img.At(x, y).RGBA()
			colours[[4]uint32{r, g, bl, a}] = true
		}
	}
	if len(colours) < minColours {
		t.Errorf("PNG has %d distinct colours, want at least %d", len(colours), minColours)
	}
}

func checkSVG(t *testing.T, path string) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(bytes.NewReader(data))
	root, elems := "", 0
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if se, ok := tok.(xml.StartElement); ok {
			if root == "" {
				root = se.Name.Local
			}
			elems++
		}
	}
	if root != "svg" || elems < 20 {
		t.Errorf("%s: root <%s>, %d elements", path, root, elems)
	}
}

func TestEventDisplayFiles(t *testing.T) {
	d := demoDetector(t)
	rng := rand.New(rand.NewPCG(3, 4))
	tr := Track{Vertex: r3.Vector{X: 120, Y: -80, Z: -150}, Dir: r3.Vector{X: 0.48, Y: 0.6, Z: 0.64}, CosCherenkov: 0.75, Label: "test"}
	hits := ringHits(d, tr, rng)
	dir := t.TempDir()
	for _, by := range []ColorBy{ByTime, ByCharge} {
		e, err := NewEventDisplay(EventConfig{Detector: d, Hits: hits, Track: &tr, ColorBy: by, Title: "test event"})
		if err != nil {
			t.Fatal(err)
		}
		if len(e.Ring) == 0 {
			t.Error("no ring traced")
		}
		const w, h = 8 * vg.Inch, 7 * vg.Inch
		p := filepath.Join(dir, "event.png")
		if err := Save(p, e, w, h); err != nil {
			t.Fatal(err)
		}
		f, err := os.Open(p)
		if err != nil {
			t.Fatal(err)
		}
		checkPNG(t, f, w, h, 30)
		f.Close()
		sp := filepath.Join(dir, "event.svg")
		if err := Save(sp, e, w, h); err != nil {
			t.Fatal(err)
		}
		checkSVG(t, sp)
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*tmp*"))
	if len(left) != 0 {
		t.Errorf("temporary files left: %v", left)
	}
	if err := Save(filepath.Join(dir, "x.jpg"), Grid{}, vg.Inch, vg.Inch); err == nil {
		t.Error(".jpg accepted")
	}
	if _, err := NewEventDisplay(EventConfig{Detector: d, Hits: []pmt.Hit{{Sensor: 0, Time: math.Inf(1)}}}); err == nil || !strings.Contains(err.Error(), "Hits[0].Time") {
		t.Errorf("infinite hit time: %v", err)
	}
	bad := tr
	bad.Vertex.X = 1e5
	if _, err := NewEventDisplay(EventConfig{Detector: d, Track: &bad}); err == nil || !strings.Contains(err.Error(), "Vertex") {
		t.Errorf("vertex outside: %v", err)
	}
}

func TestAnalysisPlotFiles(t *testing.T) {
	d := demoDetector(t)
	rng := rand.New(rand.NewPCG(5, 6))
	tr := Track{Vertex: r3.Vector{X: -60, Y: 10, Z: 40}, Dir: r3.Vector{Z: -1}, CosCherenkov: 0.75}
	hits := ringHits(d, tr, rng)
	res, err := NewResidualPlot(ResidualConfig{Detector: d, Hits: hits, Vertex: tr.Vertex, GroupVelocity: 21.8, PromptLo: -5, PromptHi: 8, Title: "residuals"})
	if err != nil {
		t.Fatal(err)
	}
	prof, err := NewChargeProfilePlot(ProfileConfig{Detector: d, Hits: hits, Vertex: tr.Vertex, Dir: tr.Dir, CosCherenkov: tr.CosCherenkov})
	if err != nil {
		t.Fatal(err)
	}
	pulls := make([]float64, 500)
	for i := range pulls {
		pulls[i] = rng.NormFloat64()
	}
	pull, err := NewPullPlot(PullConfig{Title: "pull", XLabel: "(x_fit - x_true)/σ", Pulls: pulls})
	if err != nil {
		t.Fatal(err)
	}
	f0, _ := resolution.Proportion(3, 100)
	er, err := NewErrorPlot(ErrorPlotConfig{Title: "resolution", XLabel: "E (MeV)", YLabel: "cm", LogX: true, YFromZero: true, Series: []Series{
		{Name: "a", Points: []Point{{X: 10, Y: 30, Err: 2}, {X: 20, Y: 20, Err: 1.5}}},
		{Name: "b", Points: []Point{{X: 10, Y: 35, Err: 2}, PointOfProportion(20, f0, 100)}},
	}})
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	g := Grid{Rows: 2, Cols: 2, Plots: []*plot.Plot{res, prof, pull, er}}
	const w, h = 9 * vg.Inch, 7 * vg.Inch
	var buf bytes.Buffer
	if err := Write(&buf, g, w, h, PNG); err != nil {
		t.Fatal(err)
	}
	checkPNG(t, &buf, w, h, 10)
	sp := filepath.Join(dir, "grid.svg")
	if err := Save(sp, g, w, h); err != nil {
		t.Fatal(err)
	}
	checkSVG(t, sp)
	if _, err := NewErrorPlot(ErrorPlotConfig{Series: []Series{{Points: []Point{{X: math.NaN()}}}}}); err == nil {
		t.Error("NaN point accepted")
	}
	if _, err := NewPullPlot(PullConfig{Pulls: []float64{1}}); err == nil {
		t.Error("one pull accepted")
	}
}
