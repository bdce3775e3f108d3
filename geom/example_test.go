package geom_test

import (
	"fmt"
	"log"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
)

// Lay out 20 cm sensors at 30% coverage in the demo tank.
func ExampleLayout() {
	d, err := geom.Layout(geom.DemoTank(), 20, 0.30)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(d.NumSensors(), "sensors")
	fmt.Printf("coverage %.4f\n", d.Coverage())
	// Output:
	// 4618 sensors
	// coverage 0.2999
}

// A ray from the centre of the demo tank, 60 degrees from the axis, meets
// the barrel (radius 500 cm) after 500/sin(60) = 577.35 cm.
func ExampleDetector_Intersect() {
	d, err := geom.Layout(geom.DemoTank(), 50, 0.4)
	if err != nil {
		log.Fatal(err)
	}
	u := r3.Vector{X: 0.8660254037844386, Z: 0.5}
	dist, part := d.Intersect(r3.Vector{}, u)
	fmt.Printf("%.2f cm to the %v\n", dist, part)
	dist, part = d.Intersect(r3.Vector{Z: 400}, r3.Vector{Z: 1})
	fmt.Printf("%.2f cm to the %v\n", dist, part)
	// Output:
	// 577.35 cm to the barrel
	// 120.00 cm to the top
}

// Follow a ray to the wall and find which photocathode, if any, it lands on.
func ExampleDetector_SensorAt() {
	d, err := geom.Layout(geom.DemoTank(), 50, 0.4)
	if err != nil {
		log.Fatal(err)
	}
	s := d.Sensor(0)
	// Aim from the centre at the first sensor, then just beside it.
	for _, aim := range []r3.Vector{s.Pos, s.Pos.Add(r3.Vector{Z: 40})} {
		u := aim.Normalize()
		dist, part := d.Intersect(r3.Vector{}, u)
		q := u.Mul(dist)
		fmt.Println(part, d.SensorAt(q, part))
	}
	// Output:
	// barrel 0
	// barrel -1
}
