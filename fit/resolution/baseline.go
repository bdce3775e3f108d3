package resolution

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/geom/safefile"
)

// BaselineFormat is the version of the baseline file format that
// WriteBaseline writes and ReadBaseline reads.
const BaselineFormat = 1

// A Baseline is a stored set of figures of merit of a reconstruction (68%
// resolutions, biases, pull widths, mis-identification fractions,
// efficiencies), each with its standard error, and the definition of the
// samples they were measured on, so that a later measurement can be
// compared with it by Compare. It is stored as self-describing JSON.
type Baseline struct {
	Format int `json:"format"`
	// Description says what was measured: the reconstruction, the
	// detector and anything else a reader needs.
	Description string `json:"description"`
	// Command is the command that rewrites the file.
	Command string  `json:"command,omitempty"`
	Points  []Point `json:"points"`
}

// A Point is one sample (a particle at one energy, say) and its figures.
type Point struct {
	// Name identifies the point within the baseline ("e-500").
	Name    string     `json:"name"`
	Sample  SampleSpec `json:"sample"`
	Figures []Figure   `json:"figures"`
}

// SampleSpec defines how a point's events were made, so that the figures can
// be measured again on the same events.
type SampleSpec struct {
	// PDG is the particle, Ekin its kinetic energy (MeV) or Momentum its
	// momentum (MeV/c); one of them is set.
	PDG      int     `json:"pdg"`
	Ekin     float64 `json:"ekin_mev,omitempty"`
	Momentum float64 `json:"momentum_mev,omitempty"`
	// Events is the number of events simulated, Seed the run seed.
	Events int    `json:"events"`
	Seed   uint64 `json:"seed"`
	// Detector names the detector description; Selection says how
	// vertices and directions were drawn and which events were kept.
	Detector  string `json:"detector"`
	Selection string `json:"selection,omitempty"`
}

// Worse says which way a figure worsens.
type Worse string

const (
	// Larger: a larger value is worse (a resolution, a mis-identified
	// fraction).
	Larger Worse = "larger"
	// Smaller: a smaller value is worse (an efficiency).
	Smaller Worse = "smaller"
	// Away: a value further from Figure.Target is worse (a bias, target
	// 0; a pull width, target 1).
	Away Worse = "away"
)

// A Figure is one figure of merit with its standard error. A fraction
// k/n also carries K and N, and is then compared exactly (see Compare).
type Figure struct {
	Name  string  `json:"name"`
	Unit  string  `json:"unit,omitempty"`
	Value float64 `json:"value"`
	Err   float64 `json:"err"`
	// Worse says which way the figure worsens; Target is the ideal value
	// when Worse is Away.
	Worse  Worse   `json:"worse"`
	Target float64 `json:"target,omitempty"`
	// K of N events for a fraction (both zero otherwise).
	K int `json:"k,omitempty"`
	N int `json:"n,omitempty"`
}

// EstimateFigure returns a figure from an estimate.
func EstimateFigure(name, unit string, e Estimate, worse Worse, target float64) Figure {
	return Figure{Name: name, Unit: unit, Value: e.Value, Err: e.Err, Worse: worse, Target: target}
}

// FractionFigure returns the figure of k events of n. Its Err is the
// binomial standard error sqrt(p(1-p)/n), floored at that of one event
// (so a fraction of 0 or 1 still states its resolution).
func FractionFigure(name string, k, n int, worse Worse) Figure {
	p := float64(k) / float64(n)
	e := math.Sqrt(math.Max(p*(1-p), (1-1/float64(n))/float64(n)) / float64(n))
	return Figure{Name: name, Value: p, Err: e, Worse: worse, K: k, N: n}
}

// Check validates b: the format, unique point and figure names, finite
// values, non-negative errors, a known Worse and consistent fractions.
// Errors name the point and the figure.
func (b *Baseline) Check() error {
	if b.Format != BaselineFormat {
		return fmt.Errorf("resolution: baseline format = %d, this library reads %d", b.Format, BaselineFormat)
	}
	points := map[string]bool{}
	for i, p := range b.Points {
		if p.Name == "" || points[p.Name] {
			return fmt.Errorf("resolution: baseline points[%d].name = %q is empty or repeated", i, p.Name)
		}
		points[p.Name] = true
		figs := map[string]bool{}
		for _, f := range p.Figures {
			where := fmt.Sprintf("resolution: baseline point %q figure %q", p.Name, f.Name)
			switch {
			case f.Name == "" || figs[f.Name]:
				return fmt.Errorf("%s: name empty or repeated", where)
			case math.IsNaN(f.Value) || math.IsInf(f.Value, 0):
				return fmt.Errorf("%s: value = %v must be finite", where, f.Value)
			case !(f.Err >= 0) || math.IsInf(f.Err, 0):
				return fmt.Errorf("%s: err = %v must be finite and non-negative", where, f.Err)
			case f.Worse != Larger && f.Worse != Smaller && f.Worse != Away:
				return fmt.Errorf("%s: worse = %q must be %q, %q or %q", where, f.Worse, Larger, Smaller, Away)
			case f.N < 0 || f.K < 0 || f.K > f.N:
				return fmt.Errorf("%s: k = %d, n = %d must satisfy 0 <= k <= n", where, f.K, f.N)
			}
			figs[f.Name] = true
		}
	}
	return nil
}

// maxBaselineBytes bounds what ReadBaseline reads: a baseline of a
// thousand points of twenty figures is well under a megabyte.
const maxBaselineBytes = 16 << 20

// ReadBaseline reads and checks a baseline. Unknown keys are errors, so
// a misspelt key is never silently ignored.
func ReadBaseline(r io.Reader) (*Baseline, error) {
	data, err := io.ReadAll(io.LimitReader(r, maxBaselineBytes+1))
	if err != nil {
		return nil, fmt.Errorf("resolution: reading baseline: %w", err)
	}
	if len(data) > maxBaselineBytes {
		return nil, fmt.Errorf("resolution: baseline larger than %d bytes", maxBaselineBytes)
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	var b Baseline
	if err := dec.Decode(&b); err != nil {
		return nil, fmt.Errorf("resolution: reading baseline: %w", err)
	}
	if err := b.Check(); err != nil {
		return nil, err
	}
	return &b, nil
}

// LoadBaseline reads the baseline file at path.
func LoadBaseline(path string) (*Baseline, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("resolution: %w", err)
	}
	defer f.Close()
	b, err := ReadBaseline(f)
	if err != nil {
		return nil, fmt.Errorf("%w (file %s)", err, path)
	}
	return b, nil
}

// Save checks b and writes it to path atomically as indented JSON.
func (b *Baseline) Save(path string) error {
	if err := b.Check(); err != nil {
		return err
	}
	data, err := json.MarshalIndent(b, "", "  ")
	if err != nil {
		return fmt.Errorf("resolution: %w", err)
	}
	return safefile.Write(path, func(w io.Writer) error {
		_, err := w.Write(append(data, '\n'))
		return err
	})
}

// A Change compares one figure of a new measurement with its baseline.
type Change struct {
	Point, Figure string
	Old, New      Figure
	// Sigmas is the worsening in standard errors of the difference: the
	// difference divided by the two errors added in quadrature, positive
	// when the new value is worse. For a fraction it is the one-sided
	// p-value of the exact test (below) expressed as a normal quantile.
	Sigmas float64
	// Worse reports a significant worsening: Sigmas at or above the level
	// given to Compare.
	Worse bool
}

// Comparison is the outcome of Compare.
type Comparison struct {
	Level   float64
	Changes []Change
}

// Worsened returns the changes that are significant worsenings.
func (c Comparison) Worsened() []Change {
	var out []Change
	for _, ch := range c.Changes {
		if ch.Worse {
			out = append(out, ch)
		}
	}
	return out
}

// String formats the comparison as a table, worsenings marked.
func (c Comparison) String() string {
	var sb strings.Builder
	fmt.Fprintf(&sb, "%-12s %-14s %14s %14s %8s\n", "point", "figure", "baseline", "now", "sigmas")
	for _, ch := range c.Changes {
		mark := ""
		if ch.Worse {
			mark = fmt.Sprintf("  WORSE (>= %.1f sigma)", c.Level)
		}
		fmt.Fprintf(&sb, "%-12s %-14s %14s %14s %8.2f%s\n", ch.Point, ch.Figure, formatFigure(ch.Old), formatFigure(ch.New), ch.Sigmas, mark)
	}
	return sb.String()
}

func formatFigure(f Figure) string {
	if f.N > 0 {
		return fmt.Sprintf("%d/%d", f.K, f.N)
	}
	return fmt.Sprintf("%.4g±%.2g", f.Value, f.Err)
}

// Compare compares a new measurement with a baseline, figure by figure,
// and flags each worsening of at least level standard errors (3 is
// common practice for a regression test that must not fire on noise: a
// one-sided false alarm rate of 0.13% per figure).
//
// A figure with an estimate and an error is compared by the difference
// over the errors added in quadrature (the two samples are independent
// unless they are the same events; then the test is conservative).
// A fraction k/n is compared by the one-sided Fisher exact test of the
// two 2x2 counts (conditional on the total, the new count is
// hypergeometric under equal rates; Fisher 1935, textbook), whose
// p-value is turned into the equivalent normal quantile, so that a rise
// from 0/100 to 1/100 is not called significant while a normal
// approximation with a zero error would.
//
// Every point and figure of the baseline must be in the new measurement
// and have the same sample definition; extra ones in the new measurement
// are errors too, so that nothing is compared against nothing in silence.
func Compare(base, now *Baseline, level float64) (Comparison, error) {
	if !(level > 0) || math.IsInf(level, 0) {
		return Comparison{}, fmt.Errorf("resolution: compare level = %v must be positive and finite", level)
	}
	for _, b := range []*Baseline{base, now} {
		if err := b.Check(); err != nil {
			return Comparison{}, err
		}
	}
	if len(base.Points) != len(now.Points) {
		return Comparison{}, fmt.Errorf("resolution: baseline has %d points, the new measurement %d", len(base.Points), len(now.Points))
	}
	c := Comparison{Level: level}
	for _, bp := range base.Points {
		np, ok := findPoint(now, bp.Name)
		if !ok {
			return Comparison{}, fmt.Errorf("resolution: point %q of the baseline is not in the new measurement", bp.Name)
		}
		if bp.Sample != np.Sample {
			return Comparison{}, fmt.Errorf("resolution: point %q: sample %+v differs from the baseline's %+v", bp.Name, np.Sample, bp.Sample)
		}
		if len(bp.Figures) != len(np.Figures) {
			return Comparison{}, fmt.Errorf("resolution: point %q has %d figures in the baseline, %d now", bp.Name, len(bp.Figures), len(np.Figures))
		}
		for _, bf := range bp.Figures {
			nf, ok := findFigure(np, bf.Name)
			if !ok {
				return Comparison{}, fmt.Errorf("resolution: point %q: figure %q of the baseline is not in the new measurement", bp.Name, bf.Name)
			}
			if nf.Worse != bf.Worse || nf.Target != bf.Target || (nf.N > 0) != (bf.N > 0) {
				return Comparison{}, fmt.Errorf("resolution: point %q figure %q: kind changed (worse %q target %v n %d, baseline %q %v %d)", bp.Name, bf.Name, nf.Worse, nf.Target, nf.N, bf.Worse, bf.Target, bf.N)
			}
			s, err := worsening(bf, nf)
			if err != nil {
				return Comparison{}, fmt.Errorf("resolution: point %q figure %q: %w", bp.Name, bf.Name, err)
			}
			c.Changes = append(c.Changes, Change{Point: bp.Name, Figure: bf.Name, Old: bf, New: nf, Sigmas: s, Worse: s >= level})
		}
	}
	return c, nil
}

func findPoint(b *Baseline, name string) (Point, bool) {
	for _, p := range b.Points {
		if p.Name == name {
			return p, true
		}
	}
	return Point{}, false
}

func findFigure(p Point, name string) (Figure, bool) {
	for _, f := range p.Figures {
		if f.Name == name {
			return f, true
		}
	}
	return Figure{}, false
}

// worsening returns the worsening of now against old in standard errors.
func worsening(old, now Figure) (float64, error) {
	if old.N > 0 {
		p := fisherOneSided(old.K, old.N, now.K, now.N, old.Worse)
		// Turn the p-value into the normal quantile; clamp so that p = 1
		// and p = 0 stay finite.
		p = math.Min(math.Max(p, 1e-300), 1-1e-16)
		return distuv.UnitNormal.Quantile(1 - p), nil
	}
	e := math.Hypot(old.Err, now.Err)
	if e == 0 {
		if old.Value == now.Value {
			return 0, nil
		}
		return 0, errors.New("both errors are zero and the values differ")
	}
	switch old.Worse {
	case Larger:
		return (now.Value - old.Value) / e, nil
	case Smaller:
		return (old.Value - now.Value) / e, nil
	default:
		return (math.Abs(now.Value-old.Target) - math.Abs(old.Value-old.Target)) / e, nil
	}
}

// fisherOneSided returns the one-sided p-value of Fisher's exact test that
// the new fraction k2/n2 is worse than the old k1/n1: with the total
// t = k1 + k2 fixed, k2 is hypergeometric (draws n2 from n1 + n2 holding
// t successes) when both rates are equal. For Larger (Smaller) worse the
// p-value is P(K2 >= k2) (P(K2 <= k2)); for Away it is the smaller of the
// two sides doubled, capped at 1 (a fraction has no natural target other
// than its own baseline).
func fisherOneSided(k1, n1, k2, n2 int, worse Worse) float64 {
	t := k1 + k2
	lo, hi := max(0, t-n1), min(t, n2)
	logC := func(n, k int) float64 {
		a, _ := math.Lgamma(float64(n + 1))
		b, _ := math.Lgamma(float64(k + 1))
		c, _ := math.Lgamma(float64(n - k + 1))
		return a - b - c
	}
	norm := logC(n1+n2, t)
	prob := func(k int) float64 { return math.Exp(logC(n2, k) + logC(n1, t-k) - norm) }
	var up, down float64
	for k := lo; k <= hi; k++ {
		pk := prob(k)
		if k >= k2 {
			up += pk
		}
		if k <= k2 {
			down += pk
		}
	}
	switch worse {
	case Larger:
		return math.Min(up, 1)
	case Smaller:
		return math.Min(down, 1)
	default:
		return math.Min(2*math.Min(up, down), 1)
	}
}

// Power returns the probability that Compare at the given level flags a
// relative worsening frac (0.15 for 15%) of a figure measured with
// relative standard error relErr in both the baseline and the new sample:
// the difference is normal with mean frac and standard deviation
// relErr sqrt(1 + (1+frac)^2) in units of the baseline value, so the
// power is Phi(frac / that - level). Use it to size regression samples.
func Power(relErr, frac, level float64) float64 {
	sd := relErr * math.Sqrt(1+(1+frac)*(1+frac))
	return distuv.UnitNormal.CDF(frac/sd - level)
}
