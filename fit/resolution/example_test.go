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
