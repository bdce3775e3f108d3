package pmt_test

import (
	"fmt"
	"log"
	"math/rand/v2"

	"github.com/conelight/conelight/pmt"
)

func ExampleMedium() {
	m := pmt.Medium()
	if err := m.Validate(); err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%s: %.1f cm cathode, TTS sigma %.1f ns, dark rate %.0f Hz, threshold %.2f pe\n",
		m.Name, m.CathodeDiameter, m.TTS, m.DarkRate, m.Threshold)
	fmt.Printf("peak QE x CE = %.4f\n", m.MaxEfficiency())
	// Output:
	// Medium: 20.3 cm cathode, TTS sigma 1.3 ns, dark rate 1500 Hz, threshold 0.30 pe
	// peak QE x CE = 0.2125
}

func ExampleModel_Efficiency() {
	m := pmt.Large()
	for _, c := range []struct{ lambda, cos float64 }{{400, 1}, {400, 0.2}, {550, 1}, {250, 1}} {
		e := m.Efficiency(c.lambda, c.cos)
		// A photon loop that emitted only MaxEfficiency of the photons
		// keeps each arriving one with this probability.
		fmt.Printf("%3.0f nm, cos %.1f: efficiency %.4f, survival %.3f\n",
			c.lambda, c.cos, e, e/m.MaxEfficiency())
	}
	// Output:
	// 400 nm, cos 1.0: efficiency 0.1509, survival 0.980
	// 400 nm, cos 0.2: efficiency 0.1056, survival 0.686
	// 550 nm, cos 1.0: efficiency 0.0370, survival 0.240
	// 250 nm, cos 1.0: efficiency 0.0000, survival 0.000
}

func ExampleDigitizer_Digitize() {
	m := pmt.Small()
	d, err := pmt.NewDigitizer(&m)
	if err != nil {
		log.Fatal(err)
	}
	pes := []pmt.Photoelectron{
		{Sensor: 3, Time: 12.0, Origin: pmt.Direct},
		{Sensor: 3, Time: 12.4, Origin: pmt.Direct},
		{Sensor: 3, Time: 15.0, Origin: pmt.Scattered},
		{Sensor: 0, Time: 20.0, Origin: pmt.Reflected},
		{Sensor: 7, Time: 5.0, Origin: pmt.Dark},
	}
	rng := rand.New(rand.NewPCG(1, 2))
	hits, err := d.Digitize(pes, 8, rng, nil)
	if err != nil {
		log.Fatal(err)
	}
	for _, h := range hits {
		fmt.Printf("sensor %d  t = %6.2f ns  q = %.2f pe\n", h.Sensor, h.Time, h.Charge)
	}
	// Output:
	// sensor 7  t =   4.72 ns  q = 1.20 pe
	// sensor 3  t =  12.27 ns  q = 3.33 pe
	// sensor 0  t =  19.21 ns  q = 0.31 pe
}

func ExampleTrigger_Find() {
	tr := pmt.Trigger{Threshold: 3, Window: 20, PreTrigger: 15, PostTrigger: 50}
	hits := []pmt.Hit{
		{Sensor: 4, Time: 0, Charge: 1.1},
		{Sensor: 9, Time: 100, Charge: 0.8},
		{Sensor: 2, Time: 104, Charge: 1.3},
		{Sensor: 5, Time: 111, Charge: 2.0},
		{Sensor: 1, Time: 190, Charge: 0.9},
	}
	t, ok, err := tr.Find(hits)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("triggered:", ok, "at", t, "ns")
	fmt.Println("read out:", tr.Readout(hits, t, nil))
	// Output:
	// triggered: true at 111 ns
	// read out: [{9 100 0.8} {2 104 1.3} {5 111 2}]
}

func ExampleModel_AddDark() {
	m := pmt.Large()
	rng := rand.New(rand.NewPCG(3, 4))
	// 1000 sensors at 4 kHz over a 1 us readout: 4 dark pulses expected.
	pes, err := m.AddDark(nil, 1000, -400, 600, rng)
	if err != nil {
		log.Fatal(err)
	}
	for _, pe := range pes {
		fmt.Printf("sensor %3d  t = %7.2f ns  %v\n", pe.Sensor, pe.Time, pe.Origin)
	}
	// Output:
	// sensor  19  t =  234.70 ns  Dark
	// sensor 878  t = -187.70 ns  Dark
	// sensor 615  t = -161.91 ns  Dark
	// sensor 515  t = -265.61 ns  Dark
	// sensor 731  t =  342.90 ns  Dark
	// sensor  30  t = -319.78 ns  Dark
}
