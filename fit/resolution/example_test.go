package resolution_test

import (
	"fmt"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/resolution"
)

// Summarize fitted against true values.
func ExampleSummarize() {
	var fitted, truth []resolution.Sample
	for i := range 100 {
		d := float64(i%10) - 4.5 // vertex offsets -4.5..4.5 cm along x
		fitted = append(fitted, resolution.Sample{Vertex: r3.Vector{X: d}, Dir: r3.Vector{Z: 1}, Energy: 10 + d/10})
		truth = append(truth, resolution.Sample{Dir: r3.Vector{Z: 1}, Energy: 10})
	}
	s, err := resolution.Summarize(fitted, truth)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("vertex 68%%: %.2f cm\n", s.Vertex68.Value)
	fmt.Printf("direction 68%%: %.1f deg\n", s.Direction68.Value)
	// Output:
	// vertex 68%: 3.50 cm
	// direction 68%: 0.0 deg
}

// A regression test of your own reconstruction: measure the figures on a
// fixed-seed sample, compare them with the stored baseline and fail on a
// significant worsening. In a _test.go file, write the baseline once with
// b.Save("testdata/baseline.json") (behind an -update flag), then load it
// with resolution.LoadBaseline and call t.Error for each c.Worsened().
func ExampleCompare() {
	point := func(v68 resolution.Estimate, misID int) *resolution.Baseline {
		return &resolution.Baseline{
			Format:      resolution.BaselineFormat,
			Description: "my fitter, my tank, electrons 1 m inside the wall",
			Points: []resolution.Point{{
				Name:   "e-10MeV",
				Sample: resolution.SampleSpec{PDG: 11, Ekin: 10, Events: 400, Seed: 7, Detector: "my-tank"},
				Figures: []resolution.Figure{
					resolution.EstimateFigure("vertex68", "cm", v68, resolution.Larger, 0),
					resolution.FractionFigure("misid", misID, 400, resolution.Larger),
				},
			}},
		}
	}
	stored := point(resolution.Estimate{Value: 21.4, Err: 0.9}, 2)
	now := point(resolution.Estimate{Value: 26.0, Err: 1.1}, 3)
	c, err := resolution.Compare(stored, now, 3)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, ch := range c.Worsened() {
		fmt.Printf("%s %s worse by %.1f sigma\n", ch.Point, ch.Figure, ch.Sigmas)
	}
	// Output:
	// e-10MeV vertex68 worse by 3.2 sigma
}

// Proportion reports a fraction as a physicist does: a central
// Clopper-Pearson interval, or a one-sided limit at 0 or n of n.
func ExampleProportion() {
	for _, k := range []int{3, 0, 16} {
		b, err := resolution.Proportion(k, 16)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Println(b.Percent())
	}
	// Output:
	// 3/16 = 19 +15/-10 % (68.3% CL, Clopper-Pearson)
	// 0/16 < 13 % (90% CL)
	// 16/16 > 87 % (90% CL)
}
