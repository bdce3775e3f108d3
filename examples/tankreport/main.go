// Command tankreport prints the geometry and coverage of the demo tank (or
// the large reference tank) for each preset sensor class: sensor counts per
// surface part, the photocathode coverage reached, the water volume and
// mass, and the mean distance from the centre to the wall. It optionally
// writes the layout as a sensor CSV file.
//
//	go run ./examples/tankreport
//	go run ./examples/tankreport -tank large -coverage 0.4 -csv large40.csv
package main

import (
	"flag"
	"fmt"
	"io"
	"os"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

// waterDensity is the density of liquid water at 20 C, g/cm^3 (IAPWS-95,
// Wagner and Pruss, J. Phys. Chem. Ref. Data 31 (2002) 387; from memory).
const waterDensity = 0.9982

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "tankreport",
	Does:    "Prints the geometry and coverage of the demo or large tank for each preset sensor class.",
	Reads:   "nothing",
	Writes:  "the report on standard output; optionally the layout as a sensor CSV file (-csv)",
	Example: "go run ./examples/tankreport -tank large -coverage 0.4 -csv large40.csv",
}

func main() {
	tankName := flag.String("tank", "demo", "tank: demo or large")
	coverage := flag.Float64("coverage", 0, "photocathode coverage to report (0: 0.2, 0.3 and 0.4)")
	csvPath := flag.String("csv", "", "write the layout of the large sensor class at -coverage to this CSV file")
	cli.Parse(usage)
	if err := run(os.Stdout, *tankName, *coverage, *csvPath); err != nil {
		fmt.Fprintln(os.Stderr, "tankreport:", err)
		os.Exit(1)
	}
}

func run(w io.Writer, tankName string, coverage float64, csvPath string) error {
	var tank geom.Tank
	switch tankName {
	case "demo":
		tank = geom.DemoTank()
	case "large":
		tank = geom.LargeTank()
	default:
		return fmt.Errorf("-tank = %q: want demo or large", tankName)
	}
	if err := tank.Validate(); err != nil {
		return err
	}
	coverages := []float64{0.2, 0.3, 0.4}
	if coverage != 0 {
		coverages = []float64{coverage}
	}
	fmt.Fprintf(w, "tank %q: %v\n", tankName, tank)
	fmt.Fprintf(w, "  vessel volume %.1f m3, water %.1f t at %.4f g/cm3\n",
		tank.Volume()*1e-6, tank.Volume()*waterDensity*1e-6, waterDensity)
	fmt.Fprintf(w, "  inside the sensor surface: %.1f m3, sensor surface %.1f m2\n\n",
		tank.InnerVolume()*1e-6, tank.InnerArea()*1e-4)
	fmt.Fprintf(w, "%-8s %8s %9s %8s %8s %8s %8s %8s\n", "sensor", "D (cm)", "request", "reached", "sensors", "barrel", "top", "bottom")
	for _, m := range []pmt.Model{pmt.Large(), pmt.Medium(), pmt.Small()} {
		for _, c := range coverages {
			det, err := geom.Layout(tank, m.CathodeDiameter, c)
			if err != nil {
				fmt.Fprintf(w, "%-8s %8.1f %9.3f  %v\n", m.Name, m.CathodeDiameter, c, err)
				continue
			}
			var parts [4]int
			for _, s := range det.Sensors() {
				parts[s.Surface]++
			}
			fmt.Fprintf(w, "%-8s %8.1f %9.3f %8.4f %8d %8d %8d %8d\n", m.Name, m.CathodeDiameter, c,
				det.Coverage(), det.NumSensors(), parts[geom.Barrel], parts[geom.Top], parts[geom.Bottom])
		}
	}
	if csvPath != "" {
		c := coverages[len(coverages)-1]
		det, err := geom.Layout(tank, pmt.Large().CathodeDiameter, c)
		if err != nil {
			return err
		}
		if err := geom.SaveSensorCSV(csvPath, det); err != nil {
			return err
		}
		fmt.Fprintf(w, "\nwrote %d sensors to %s\n", det.NumSensors(), csvPath)
	}
	return nil
}
