package main

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom/safefile"
	"github.com/conelight/conelight/sim/setup"
)

// The README's measured tables sit between these markers, each block
// named; regen's readme step rewrites what is between them, and the test
// of this package fails when a block differs from what would be written.
const (
	beginMarker = "<!-- begin generated %s: go run ./examples/regen -steps readme -->"
	endMarker   = "<!-- end generated %s -->"
)

// renderer renders one block from files under root (the repository).
type renderer func(root string) (string, error)

// blocks maps each generated block's name to its renderer.
var blocks = map[string]renderer{
	"tanks":          renderTanks,
	"lowenergy-demo": renderLowEnergyDemo,
	"ring-demo":      renderRingDemo,
	"quickstart":     renderQuickstart,
}

// updateREADME rewrites the generated blocks of the README at path and
// returns how many changed.
func updateREADME(path string) (int, error) {
	old, err := os.ReadFile(path)
	if err != nil {
		return 0, err
	}
	now, changed, err := renderBlocks(old, filepath.Dir(path))
	if err != nil {
		return 0, err
	}
	if changed == 0 {
		return 0, nil
	}
	return changed, safefile.Write(path, func(w io.Writer) error { _, err := w.Write(now); return err })
}

// renderBlocks returns text with every generated block re-rendered and
// the number of blocks whose content changed. Every block in the text
// must have a renderer and every renderer a block, so that no table is
// left typed by hand or silently dropped.
func renderBlocks(text []byte, root string) ([]byte, int, error) {
	var out bytes.Buffer
	seen := map[string]bool{}
	changed := 0
	rest := text
	for {
		i := bytes.Index(rest, []byte("<!-- begin generated "))
		if i < 0 {
			out.Write(rest)
			break
		}
		lineEnd := bytes.IndexByte(rest[i:], '\n')
		if lineEnd < 0 {
			return nil, 0, fmt.Errorf("README: unterminated begin marker at byte %d", len(text)-len(rest)+i)
		}
		head := string(rest[i : i+lineEnd])
		name := strings.TrimPrefix(head, "<!-- begin generated ")
		name = name[:strings.IndexAny(name+":", ": ")]
		if fmt.Sprintf(beginMarker, name) != head {
			return nil, 0, fmt.Errorf("README: malformed begin marker %q (want %q)", head, fmt.Sprintf(beginMarker, name))
		}
		r, ok := blocks[name]
		if !ok {
			return nil, 0, fmt.Errorf("README: block %q has no renderer", name)
		}
		if seen[name] {
			return nil, 0, fmt.Errorf("README: block %q appears twice", name)
		}
		seen[name] = true
		end := fmt.Sprintf(endMarker, name)
		body := rest[i+lineEnd+1:]
		j := bytes.Index(body, []byte(end))
		if j < 0 {
			return nil, 0, fmt.Errorf("README: block %q has no end marker %q", name, end)
		}
		content, err := r(root)
		if err != nil {
			return nil, 0, fmt.Errorf("README block %q: %w", name, err)
		}
		if string(body[:j]) != content {
			changed++
		}
		out.Write(rest[:i+lineEnd+1])
		out.WriteString(content)
		out.WriteString(end)
		rest = body[j+len(end):]
	}
	for name := range blocks {
		if !seen[name] {
			return nil, 0, fmt.Errorf("README: no block %q (add the markers %q and %q)", name, fmt.Sprintf(beginMarker, name), fmt.Sprintf(endMarker, name))
		}
	}
	return out.Bytes(), changed, nil
}

// renderTanks lists the built-in detector descriptions as the code
// builds them.
func renderTanks(string) (string, error) {
	var b strings.Builder
	b.WriteString("| description | vessel radius x height (cm) | sensors | cathode diameter (cm) | coverage reached |\n| --- | --- | --- | --- | --- |\n")
	for _, mk := range []func() (setup.Setup, error){setup.Demo, setup.Large} {
		s, err := mk()
		if err != nil {
			return "", err
		}
		t := s.Detector.Tank()
		fmt.Fprintf(&b, "| %s | %g x %g | %s | %g | %.1f%% |\n", s.Name, t.Radius, t.Height, thousands(s.Detector.NumSensors()), s.Detector.CathodeDiameter(), 100*s.Detector.Coverage())
	}
	return b.String(), nil
}

// thousands formats n with a comma between groups of three digits.
func thousands(n int) string {
	s := strconv.Itoa(n)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}

// renderLowEnergyDemo renders the low-energy fitter's regression baseline.
func renderLowEnergyDemo(root string) (string, error) {
	b, err := resolution.LoadBaseline(filepath.Join(root, "testdata/fit/resolution_demo.json"))
	if err != nil {
		return "", err
	}
	if len(b.Points) == 0 {
		return "", fmt.Errorf("testdata/fit/resolution_demo.json: no points")
	}
	s0 := b.Points[0].Sample
	var out strings.Builder
	fmt.Fprintf(&out, "Demo tank, electrons 1 m or more inside the wall, isotropic, %d events per energy (run seed %d), errors are statistical (1 sigma); pull widths are Gaussian cores of (fit - truth) / reported error (1 when the errors are right):\n\n", s0.Events, s0.Seed)
	out.WriteString("| E (MeV) | converged | vertex 68% (cm) | direction 68% (deg) | energy resolution (Gaussian core) | pull widths x, y, z, t | pull widths angles, energy | suspect | far (> 3 m), not suspect |\n| --- | --- | --- | --- | --- | --- | --- | --- | --- |\n")
	for _, p := range b.Points {
		fig := map[string]resolution.Figure{}
		for _, f := range p.Figures {
			fig[f.Name] = f
		}
		pm := func(name string, scale float64, format string) string {
			f := fig[name]
			return fmt.Sprintf(format+" ± "+format, scale*f.Value, scale*f.Err)
		}
		pulls := func(names ...string) string {
			var parts []string
			for _, n := range names {
				parts = append(parts, fmt.Sprintf("%.2f", fig["pull_"+n].Value))
			}
			return strings.Join(parts, ", ")
		}
		frac := func(name string) string {
			f := fig[name]
			return fmt.Sprintf("%d/%d", f.K, f.N)
		}
		nc := fig["not_converged"]
		fmt.Fprintf(&out, "| %g | %d/%d | %s | %s | %s%% | %s | %s | %s | %s |\n", p.Sample.Ekin, nc.N-nc.K, nc.N,
			pm("vertex68", 1, "%.1f"), pm("direction68", 1, "%.1f"), pm("energy_resolution", 100, "%.1f"),
			pulls("x", "y", "z", "time"), pulls("angle1", "angle2", "ekin"), frac("suspect"), frac("far_unflagged"))
	}
	return out.String(), nil
}

// renderRingDemo renders the ring fitter's regression baseline: each 68%
// quantile with the half width of its stored band divided by the band's
// 4 binomial standard errors as a 1-sigma error.
func renderRingDemo(root string) (string, error) {
	f, err := os.Open(filepath.Join(root, "testdata/ring/demo_baseline.txt"))
	if err != nil {
		return "", err
	}
	defer f.Close()
	type row struct {
		vals  map[string][3]float64
		order int
	}
	rows := map[string]*row{}
	var names []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || line[0] == '#' {
			continue
		}
		fs := strings.Fields(line)
		if len(fs) != 5 {
			return "", fmt.Errorf("ring baseline line %q: want 5 fields", line)
		}
		point, metric, ok := strings.Cut(fs[0], "/")
		if !ok {
			return "", fmt.Errorf("ring baseline line %q: no point/metric", line)
		}
		var v [5]float64
		for k := 1; k < 5; k++ {
			if v[k], err = strconv.ParseFloat(fs[k], 64); err != nil {
				return "", fmt.Errorf("ring baseline line %q: %w", line, err)
			}
		}
		r, ok := rows[point]
		if !ok {
			r = &row{vals: map[string][3]float64{}}
			rows[point] = r
			names = append(names, point)
		}
		r.vals[metric] = [3]float64{v[1], v[2], (v[4] - v[3]) / 8}
	}
	if err := sc.Err(); err != nil {
		return "", err
	}
	var b strings.Builder
	b.WriteString("| particle, p (MeV/c) | events | vertex 68% (cm) | direction 68% (deg) | momentum 68% | mis-identified |\n| --- | --- | --- | --- | --- | --- |\n")
	var qe, pulls []string
	for _, name := range names {
		r := rows[name]
		if e, ok := r.vals["enu68"]; ok {
			qe = append(qe, fmt.Sprintf("%s %.1f%% (%d events)", strings.TrimPrefix(name, "qe-"), 100*e[0], int(e[1])))
			continue
		}
		if name == "pull" {
			for _, k := range []string{"x", "y", "z", "t", "angle", "energy"} {
				if v, ok := r.vals[k]; ok {
					pulls = append(pulls, fmt.Sprintf("%s %.2f", k, v[0]))
				}
			}
			continue
		}
		part, p, _ := strings.Cut(name, "-")
		v, a, m, id := r.vals["vertex68"], r.vals["angle68"], r.vals["momentum68"], r.vals["misid"]
		fmt.Fprintf(&b, "| %s, %s | %d | %.1f ± %.1f | %.2f ± %.2f | %.1f ± %.1f%% | %d/%d |\n", part, p, int(v[1]), v[0], v[2], a[0], a[2], 100*m[0], 100*m[2], int(id[0]), int(id[1]))
	}
	if len(qe) > 0 {
		fmt.Fprintf(&b, "\nQuasi-elastic neutrino energy, 68%% of |E_fit - E_true|/E_true: %s.\n", strings.Join(qe, ", "))
	}
	if len(pulls) > 0 {
		fmt.Fprintf(&b, "\nPull widths (half the 16-84%% range of (fit - truth) / reported error; 1 for calibrated errors): %s.\n", strings.Join(pulls, ", "))
	}
	return b.String(), nil
}

// renderQuickstart quotes the main function of examples/quickstart, the
// README's first program, so that the README shows the code that runs
// (and is tested) and not a copy that can drift.
func renderQuickstart(root string) (string, error) {
	src, err := os.ReadFile(filepath.Join(root, "examples/quickstart/main.go"))
	if err != nil {
		return "", err
	}
	text := string(src)
	i := strings.Index(text, "\nfunc main() {\n")
	if i < 0 {
		return "", fmt.Errorf("examples/quickstart/main.go has no func main")
	}
	j := strings.Index(text[i:], "\n}\n")
	if j < 0 {
		return "", fmt.Errorf("examples/quickstart/main.go: func main has no end")
	}
	return "```go\n" + text[i+1:i+j+3] + "```\n", nil
}
