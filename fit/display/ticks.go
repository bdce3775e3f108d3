package display

import (
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/plot"
)

// tidyTicks labels the ticks of its Ticker with the fewest decimals that
// write every label of the axis exactly, the same number for all: "0, 25,
// 50" rather than "0.00, 25.00, 50.00", "0.5, 1.0, 1.5" rather than
// "0.5, 1, 1.5". Every axis display draws uses it, so the labels of one
// figure read alike.
type tidyTicks struct{ plot.Ticker }

func (t tidyTicks) Ticks(min, max float64) []plot.Tick {
	ts := t.Ticker.Ticks(min, max)
	var vals []float64
	for _, tk := range ts {
		if tk.Label != "" {
			vals = append(vals, tk.Value)
		}
	}
	prec := decimals(vals)
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = formatTick(ts[i].Value, prec)
		}
	}
	return ts
}

// formatTick writes v with prec decimals, without a minus sign on zero.
func formatTick(v float64, prec int) string {
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if r, _ := strconv.ParseFloat(s, 64); r == 0 {
		s = strconv.FormatFloat(0, 'f', prec, 64)
	}
	return s
}

// decimals returns the fewest decimals (at most 6) that write every value
// of vs to within 1e-9 of the largest magnitude.
func decimals(vs []float64) int {
	scale := 0.0
	for _, v := range vs {
		scale = math.Max(scale, math.Abs(v))
	}
	for prec := 0; prec < 6; prec++ {
		ok := true
		for _, v := range vs {
			r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', prec, 64), 64)
			if math.Abs(r-v) > 1e-9*scale {
				ok = false
				break
			}
		}
		if ok {
			return prec
		}
	}
	return 6
}

// tidyAxes gives both axes of p tidy labels.
func tidyAxes(p *plot.Plot) {
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		if _, ok := a.Tick.Marker.(tidyTicks); !ok {
			a.Tick.Marker = tidyTicks{a.Tick.Marker}
		}
	}
}

// valueTicks marks a logarithmic axis at the given values (the energies of
// a study's points), each labelled unless it would crowd the previous
// label (closer than 6% of the axis in log), with unlabelled ticks at
// 1..9 times the powers of ten between.
type valueTicks []float64

func (v valueTicks) Ticks(min, max float64) []plot.Tick {
	vals := slices.Clone([]float64(v))
	slices.Sort(vals)
	vals = slices.Compact(vals)
	var in []float64
	for _, x := range vals {
		if x >= min && x <= max {
			in = append(in, x)
		}
	}
	prec := decimals(in)
	span := math.Log10(max / min)
	var ts []plot.Tick
	last := math.Inf(-1)
	for _, x := range in {
		t := plot.Tick{Value: x}
		if math.Log10(x)-last >= 0.06*span {
			t.Label = formatTick(x, prec)
			last = math.Log10(x)
		}
		ts = append(ts, t)
	}
	for _, t := range (plot.LogTicks{}).Ticks(min, max) {
		if t.Value >= min && t.Value <= max && !slices.Contains(in, t.Value) {
			ts = append(ts, plot.Tick{Value: t.Value})
		}
	}
	return ts
}
