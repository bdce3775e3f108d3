package display_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

// ExampleNewEventDisplay draws the hits of an event on the unrolled demo
// tank with a fitted track and writes it as PNG. Here the "event" is the
// sensors a cone from the tank centre along +z reaches, with direct-light
// times.
func ExampleNewEventDisplay() {
	det, err := geom.Layout(geom.DemoTank(), pmt.Medium().CathodeDiameter, 0.3)
	if err != nil {
		log.Fatal(err)
	}
	tr := display.Track{Dir: r3.Vector{Z: 1}, CosCherenkov: 0.75, Label: "fit"}
	var hits []pmt.Hit
	for _, s := range det.Sensors() {
		r := s.Pos.Sub(tr.Vertex)
		if c := r.Dot(tr.Dir) / r.Norm(); c > 0.72 && c < 0.78 {
			hits = append(hits, pmt.Hit{Sensor: s.Index, Time: r.Norm() / 22, Charge: 2})
		}
	}
	ed, err := display.NewEventDisplay(display.EventConfig{Detector: det, Hits: hits, Track: &tr, Title: "a ring on the top cap"})
	if err != nil {
		log.Fatal(err)
	}
	dir, err := os.MkdirTemp("", "display")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	if err := display.Save(filepath.Join(dir, "event.png"), ed, 8*vg.Inch, 7.5*vg.Inch); err != nil {
		log.Fatal(err)
	}
	w, h := display.PixelSize(8*vg.Inch, 7.5*vg.Inch)
	fmt.Printf("%d ring piece(s), %dx%d pixels\n", len(ed.Ring), w, h)
	// Output:
	// 1 ring piece(s), 1200x1125 pixels
}

// ExampleNewErrorPlot plots a resolution against energy with error bars.
func ExampleNewErrorPlot() {
	p, err := display.NewErrorPlot(display.ErrorPlotConfig{
		Title: "vertex resolution", XLabel: "kinetic energy (MeV)", YLabel: "68% (cm)", LogX: true, YFromZero: true,
		Series: []display.Series{{Name: "e-", Points: []display.Point{{X: 5, Y: 31.7, Err: 1.8}, {X: 10, Y: 21.4, Err: 1.1}, {X: 20, Y: 20.0, Err: 2.1}}}},
	})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(p.Y.Min, p.X.Min < 5)
	// Output:
	// 0 true
}
