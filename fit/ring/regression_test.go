package ring

import (
	"bufio"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

var update = flag.Bool("update", false, "rewrite the regression baselines in testdata/ring")

const baselinePath = "../../testdata/ring/demo_baseline.txt"

// demoPoints are the regression points in the demo tank; demoEvents
// events each, vertices at least demoWall cm inside the sensor surface.
var demoPoints = []point{
	{"e-250", phys.Electron, 250},
	{"e-600", phys.Electron, 600},
	{"e-1200", phys.Electron, 1200},
	{"mu-300", phys.MuonMinus, 300},
	{"mu-600", phys.MuonMinus, 600},
	{"mu-1000", phys.MuonMinus, 1000},
}

const (
	demoEvents = 16
	demoWall   = 150.0
	qeEvents   = 12
	// sigmas is the tolerance of every comparison with the baseline, in
	// standard errors derived from the sample size.
	sigmas = 4
)

// metric is one baselined number with the sample size it came from.
type metric struct {
	name   string
	value  float64
	n      int
	lo, hi float64 // band of a quantile (see quantileBand)
}

// q68 is the 68% quantile metric of xs with its band.
func q68(name string, xs []float64) metric {
	lo, hi := quantileBand(xs, 0.68)
	return metric{name, quantile(xs, 0.68), len(xs), lo, hi}
}

// TestDemoRegression simulates the demo tank at fixed seeds, fits each
// event with both hypotheses and compares the 68% quantiles of the vertex,
// direction and momentum errors, the mis-identification counts, the pull
// widths and the quasi-elastic neutrino energy resolution with the
// baselines in testdata/ring. Tolerances follow from the sample sizes:
//   - a 68% quantile must stay inside the distribution-free band of order
//     statistics of the baseline sample at quantile levels 0.68 +- 4
//     sqrt(0.68*0.32/N) (binomial standard error of the level);
//   - a mis-ID count k must stay below k0 + 4 sqrt(N p(1-p)), p =
//     max(k0, 1)/N (binomial);
//   - a pull width w (half the 16-84% range) within 4 * 1.1 w0/sqrt(n),
//     the large-sample standard error of that width for a normal sample
//     (variance of a sample quantile p(1-p)/(n f(x_p)^2)).
//
// Run with -update to rewrite the baselines after an intended change.
func TestDemoRegression(t *testing.T) {
	if testing.Short() {
		t.Skip("regression study skipped in -short mode")
	}
	d := demoTank(t)
	var got []metric
	var lines []string
	pulls := map[string][]float64{}
	for i, pt := range demoPoints {
		s := study(t, d.sim, d.fit, pt, demoEvents, demoWall, uint64(1000+i), nil)
		for k, v := range s.pulls {
			pulls[k] = append(pulls[k], v...)
		}
		got = append(got, pointMetrics(pt.name, s)...)
		lines = append(lines, summary(pt.name, s))
	}
	for _, p := range []struct {
		name string
		nu   int
		pdg  int
	}{{"qe-numu-700", phys.MuonNeu, phys.MuonMinus}, {"qe-nue-700", phys.ElectronNeu, phys.Electron}} {
		qe, err := gen.NewQE(gen.QEConfig{Neutrino: p.nu, Etot: gen.FixedEnergy(700), Beam: r3.Vector{X: 1},
			Vertex: gen.InFiducial(d.cfg.Detector.Tank(), demoWall)})
		if err != nil {
			t.Fatal(err)
		}
		s := study(t, d.sim, d.fit, point{p.name, p.pdg, 0}, qeEvents, demoWall, 2000+uint64(p.nu), qe)
		got = append(got, q68(p.name+"/enu68", s.enu), metric{p.name + "/misid", float64(s.misID), s.n, 0, 0})
		lines = append(lines, summary(p.name, s)+fmt.Sprintf(" E_nu 68%% %.3f", quantile(s.enu, 0.68)))
	}
	for _, k := range []string{"x", "y", "z", "t", "angle", "energy"} {
		got = append(got, metric{"pull/" + k, width(pulls[k]), len(pulls[k]), 0, 0})
		lines = append(lines, fmt.Sprintf("pull %-6s width %.2f median %+.2f (n %d)", k, width(pulls[k]), quantile(pulls[k], 0.5), len(pulls[k])))
	}
	for _, l := range lines {
		t.Log(l)
	}
	if *update {
		if err := writeBaseline(baselinePath, got); err != nil {
			t.Fatal(err)
		}
		return
	}
	base, err := readBaseline(baselinePath)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range got {
		b, ok := base[m.name]
		if !ok {
			t.Errorf("%s: no baseline (run with -update)", m.name)
			continue
		}
		lo, hi := tolerance(m.name, b)
		if math.IsNaN(m.value) || m.value < lo || m.value > hi {
			t.Errorf("%s = %.4g outside [%.4g, %.4g] (baseline %.4g from %d events)", m.name, m.value, lo, hi, b.value, b.n)
		}
	}
}

// baseline holds a baselined value and the order statistics that bound it.
type baseline struct {
	value  float64
	n      int
	lo, hi float64 // band of the value, written with it
}

func pointMetrics(name string, s sample) []metric {
	return []metric{
		q68(name+"/vertex68", s.vertex),
		q68(name+"/angle68", s.angle),
		q68(name+"/momentum68", s.momentum),
		{name + "/misid", float64(s.misID), s.n, 0, 0},
		{name + "/failed", float64(s.failed), s.n, 0, 0},
	}
}

func summary(name string, s sample) string {
	return fmt.Sprintf("%-12s n %2d failed %d misID %d | vertex 68%% %6.1f cm  direction 68%% %5.2f deg  momentum 68%% %5.3f | %.2f s/event %v",
		name, s.n, s.failed, s.misID, quantile(s.vertex, 0.68), quantile(s.angle, 0.68), quantile(s.momentum, 0.68), s.cpu.Seconds()/float64(s.n), s.reasons)
}

// tolerance returns the accepted band of a metric given its baseline.
func tolerance(name string, b baseline) (lo, hi float64) {
	n := float64(b.n)
	switch {
	case strings.HasSuffix(name, "/misid") || strings.HasSuffix(name, "/failed"):
		p := math.Max(b.value, 1) / n
		return 0, b.value + sigmas*math.Sqrt(n*p*(1-p))
	case strings.HasPrefix(name, "pull/"):
		d := sigmas * 1.1 * b.value / math.Sqrt(n)
		return b.value - d, b.value + d
	}
	return b.lo, b.hi
}

// quantileBand returns the order statistics of xs at quantile levels q
// -+ sigmas binomial standard errors.
func quantileBand(xs []float64, q float64) (lo, hi float64) {
	n := float64(len(xs))
	se := math.Sqrt(q * (1 - q) / n)
	return quantile(xs, math.Max(q-sigmas*se, 0)), quantile(xs, math.Min(q+sigmas*se, 1))
}

func writeBaseline(path string, ms []metric) error {
	var b strings.Builder
	b.WriteString("# conelight fit/ring regression baseline, demo tank (sim.DemoConfig(7)).\n")
	b.WriteString("# Source: TestDemoRegression in fit/ring, written by\n")
	b.WriteString("#   go test ./fit/ring -run TestDemoRegression -update\n")
	b.WriteString("# Columns: metric value events band_lo band_hi. For 68% quantiles the band is\n")
	b.WriteString("# the baseline sample's order statistics at levels 0.68 -+ 4 binomial standard\n")
	b.WriteString("# errors; other metrics derive their band from value and events in the test.\n")
	for _, m := range ms {
		fmt.Fprintf(&b, "%s %.6g %d %.6g %.6g\n", m.name, m.value, m.n, m.lo, m.hi)
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".baseline-*")
	if err != nil {
		return err
	}
	if _, err := tmp.WriteString(b.String()); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	if err := tmp.Chmod(0o644); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	if err := tmp.Close(); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	return os.Rename(tmp.Name(), path)
}

func readBaseline(path string) (map[string]baseline, error) {
	fh, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer fh.Close()
	out := map[string]baseline{}
	sc := bufio.NewScanner(fh)
	for ln := 1; sc.Scan(); ln++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || line[0] == '#' {
			continue
		}
		f := strings.Fields(line)
		if len(f) != 5 {
			return nil, fmt.Errorf("%s line %d: want 5 fields, got %d", path, ln, len(f))
		}
		var b baseline
		var errs [4]error
		b.value, errs[0] = strconv.ParseFloat(f[1], 64)
		b.n, errs[1] = strconv.Atoi(f[2])
		b.lo, errs[2] = strconv.ParseFloat(f[3], 64)
		b.hi, errs[3] = strconv.ParseFloat(f[4], 64)
		for _, e := range errs {
			if e != nil {
				return nil, fmt.Errorf("%s line %d: %v", path, ln, e)
			}
		}
		out[f[0]] = b
	}
	return out, sc.Err()
}
