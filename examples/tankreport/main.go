// Command tankreport checks a detector description and prints what
// follows from it, or plans the sensor layouts of a built-in tank.
//
// With -detector (a description file, sim/setup format, or a built-in
// name) it validates the description, reporting every problem with its
// key and line, and prints the derived facts: sensor count per surface
// part, coverage reached, water mass, the light yield per MeV of a
// reference electron (simulated, with its standard error), the dark hits
// expected per readout window and in the trigger window, and which
// low-energy fitter table sets suit the detector. -save writes the
// detector as a description file in canonical form: the way to turn the
// detector of an event file into a description.
//
// Without -detector it prints, for the demo or large tank and each preset
// sensor class, the sensor counts per surface part and the coverage
// reached, and optionally writes a layout as a sensor CSV file.
//
//	go run ./examples/tankreport -detector testdata/setup/example.toml
//	go run ./examples/tankreport -detector large -events 100
//	go run ./examples/tankreport -tank large -coverage 0.4 -csv large40.csv
package main

import (
	"flag"
	"fmt"
	"io"
	"os"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/setup"
)

// waterDensity is the density of liquid water at 20 C, g/cm^3 (IAPWS-95,
// Wagner and Pruss, J. Phys. Chem. Ref. Data 31 (2002) 387; from memory).
const waterDensity = 0.9982

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "tankreport",
	Does:    "With -detector: checks a detector description and prints what follows from it (sensors, coverage, water mass, light yield of a reference electron, dark noise, which low-energy fitter tables suit it). Without: prints the geometry and coverage of the demo or large tank for each preset sensor class.",
	Reads:   "the description file given by -detector, if any (and the sensor CSV it names)",
	Writes:  "the report on standard output; optionally the detector as a description file (-save) or a layout as a sensor CSV file (-csv)",
	Example: "go run ./examples/tankreport -detector testdata/setup/example.toml",
}

func main() {
	tankName := flag.String("tank", "demo", "tank: demo or large")
	coverage := flag.Float64("coverage", 0, "photocathode coverage to report (0: 0.2, 0.3 and 0.4)")
	csvPath := flag.String("csv", "", "write the layout of the large sensor class at -coverage to this CSV file")
	spec := detflag.Register(flag.CommandLine, "")
	events := flag.Int("events", 200, "with -detector: reference electrons simulated for the light yield (0: skip)")
	ekin := flag.Float64("energy", 10, "with -detector: kinetic energy of the reference electron, MeV")
	seed := flag.Uint64("seed", 1, "with -detector: seed of the reference-electron run")
	save := flag.String("save", "", "with -detector: write the detector as a description file (canonical form; e.g. the detector of an event file)")
	cli.Parse(usage)
	var err error
	if *spec != "" {
		err = report(os.Stdout, *spec, yieldOptions{Events: *events, Ekin: *ekin, Seed: *seed}, *save)
	} else {
		err = run(os.Stdout, *tankName, *coverage, *csvPath)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "tankreport:", err)
		os.Exit(1)
	}
}

// report loads the description spec and describes it.
func report(w io.Writer, spec string, yo yieldOptions, save string) error {
	if yo.Events < 0 || yo.Events > maxEvents {
		return fmt.Errorf("-events = %d outside [0, %d]", yo.Events, maxEvents)
	}
	if !(yo.Ekin > 0 && yo.Ekin <= 1000) {
		return fmt.Errorf("-energy = %g MeV outside (0, 1000]", yo.Ekin)
	}
	s, err := detflag.Load(spec)
	if err != nil {
		return err
	}
	if err := describe(w, spec, s, yo); err != nil {
		return err
	}
	if save != "" {
		if err := setup.Save(save, s); err != nil {
			return err
		}
		fmt.Fprintf(w, "wrote the description to %s\n", save)
	}
	return nil
}

// maxEvents bounds -events: the yield's standard error falls as
// 1/sqrt(events), and 100,000 electrons give it to 0.3% of the spread.
const maxEvents = 100000

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
