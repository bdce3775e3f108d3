package main

import (
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
	"ring-large":     renderRingLarge,
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

// loadRingBaseline reads a ring baseline (resolution.Baseline JSON) under
// root.
func loadRingBaseline(root, rel string) (*resolution.Baseline, error) {
	return resolution.LoadBaseline(filepath.Join(root, rel))
}

// ringFigure returns the named figure of p.
func ringFigure(p resolution.Point, name string) (resolution.Figure, bool) {
	for _, f := range p.Figures {
		if f.Name == name {
			return f, true
		}
	}
	return resolution.Figure{}, false
}

// ringLabel turns "e-600" into "e, 600".
func ringLabel(name string) string {
	part, mom, _ := strings.Cut(name, "-")
	return part + ", " + mom
}

// fmtFigure formats a figure as "value ± err" with the given format for
// both, or "n/a" when p lacks it.
func fmtFigure(p resolution.Point, name, format string) string {
	f, ok := ringFigure(p, name)
	if !ok {
		return "n/a"
	}
	return fmt.Sprintf(format+" ± "+strings.Replace(format, "+", "", 1), f.Value, f.Err)
}

// fmtFraction formats a fraction figure as k/n with its Clopper-Pearson
// interval (68.3% CL; a one-sided upper limit at 0/n).
func fmtFraction(p resolution.Point, name string) string {
	f, ok := ringFigure(p, name)
	if !ok || f.N == 0 {
		return "n/a"
	}
	b, err := resolution.ClopperPearson(f.K, f.N, 0.6827)
	if err != nil {
		return fmt.Sprintf("%d/%d", f.K, f.N)
	}
	return b.Percent()
}

// renderRingDemo renders the ring fitter's regression baseline
// (testdata/ring/demo_baseline.json): each 68% quantile with its
// order-statistic error, the mis-identified fraction with its
// Clopper-Pearson interval, the quasi-elastic neutrino energy resolution
// and the pooled pull widths.
func renderRingDemo(root string) (string, error) {
	b, err := loadRingBaseline(root, "testdata/ring/demo_baseline.json")
	if err != nil {
		return "", err
	}
	var sb strings.Builder
	sb.WriteString("| particle, p (MeV/c) | events | vertex 68% (cm) | direction 68% (deg) | momentum 68% (%) | mis-identified |\n| --- | --- | --- | --- | --- | --- |\n")
	var qe, pulls []string
	for _, p := range b.Points {
		switch {
		case strings.HasPrefix(p.Name, "qe-"):
			qe = append(qe, fmt.Sprintf("%s %s%% (%d events)", strings.TrimPrefix(p.Name, "qe-"), fmtFigure(p, "enu68", "%.1f"), p.Sample.Events))
		case p.Name == "pulls":
			for _, f := range p.Figures {
				pulls = append(pulls, fmt.Sprintf("%s %.2f ± %.2f", f.Name, f.Value, f.Err))
			}
		default:
			fmt.Fprintf(&sb, "| %s | %d | %s | %s | %s | %s |\n", ringLabel(p.Name), p.Sample.Events,
				fmtFigure(p, "vertex68", "%.1f"), fmtFigure(p, "direction68", "%.2f"), fmtFigure(p, "momentum68", "%.1f"), fmtFraction(p, "misid"))
		}
	}
	if len(qe) > 0 {
		fmt.Fprintf(&sb, "\nQuasi-elastic neutrino energy, 68%% of |E_fit - E_true|/E_true: %s.\n", strings.Join(qe, ", "))
	}
	if len(pulls) > 0 {
		fmt.Fprintf(&sb, "\nPull widths (Gaussian core of (fit - truth) / reported error, pooled over the particle points; 1 for calibrated errors): %s.\n", strings.Join(pulls, ", "))
	}
	return sb.String(), nil
}

// renderRingLarge renders the large-tank study of the ring fitter
// (testdata/ring/large_study.json, written by examples/ringstudy): per
// point the resolutions, the vertex bias along the track, the
// mis-identification, the pull widths and the median Cramer-Rao bounds
// with the achieved/bound ratios, each with its error and sample size.
func renderRingLarge(root string) (string, error) {
	b, err := loadRingBaseline(root, "testdata/ring/large_study.json")
	if err != nil {
		return "", err
	}
	var sb strings.Builder
	sb.WriteString("| particle, p (MeV/c) | events | vertex 68% (cm) | direction 68% (deg) | momentum 68% (%) | vertex bias along track (cm) | mis-identified (zero cut) |\n| --- | --- | --- | --- | --- | --- | --- |\n")
	var pid []string
	for _, p := range b.Points {
		if p.Name == "pid-calibrated" {
			pid = append(pid, "electrons called muons "+fmtFraction(p, "e_called_mu"), "muons called electrons "+fmtFraction(p, "mu_called_e"))
			continue
		}
		fmt.Fprintf(&sb, "| %s | %d | %s | %s | %s | %s | %s |\n", ringLabel(p.Name), p.Sample.Events,
			fmtFigure(p, "vertex68", "%.1f"), fmtFigure(p, "direction68", "%.2f"), fmtFigure(p, "momentum68", "%.1f"),
			fmtFigure(p, "bias_along", "%+.1f"), fmtFraction(p, "misid"))
	}
	if len(pid) > 0 {
		fmt.Fprintf(&sb, "\nWith an identity cut calibrated (`ring.CalibratePID`) on the even events and counted on the odd ones: %s.\n", strings.Join(pid, ", "))
	}
	sb.WriteString("\nPull widths (Gaussian core; 1 for calibrated errors) and median Cramer-Rao bounds with the ratio achieved 68% / bound:\n\n")
	sb.WriteString("| particle, p (MeV/c) | x | y | z | t | angle 1 | angle 2 | momentum | bound: vertex (cm) | direction (deg) | momentum (%) |\n| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |\n")
	for _, p := range b.Points {
		if p.Name == "pid-calibrated" {
			continue
		}
		row := []string{ringLabel(p.Name)}
		for _, k := range []string{"x", "y", "z", "t", "angle1", "angle2", "momentum"} {
			row = append(row, fmtFigure(p, "pull_"+k, "%.2f"))
		}
		for _, k := range []string{"crb_vertex", "crb_direction", "crb_momentum"} {
			c, ok1 := ringFigure(p, k)
			r, ok2 := ringFigure(p, k+"_ratio")
			if ok1 && ok2 {
				row = append(row, fmt.Sprintf("%.2f (x%.1f ± %.1f)", c.Value, r.Value, r.Err))
			} else {
				row = append(row, "n/a")
			}
		}
		sb.WriteString("| " + strings.Join(row, " | ") + " |\n")
	}
	return sb.String(), nil
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
