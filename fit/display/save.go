package display

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/conelight/conelight/geom/safefile"
)

// PNGDPI is the resolution of PNG files: a figure of width w (vg.Length)
// is w/vg.Inch*PNGDPI pixels wide, rounded to the nearest pixel.
const PNGDPI = 150

// Figure is anything that draws itself on a canvas: *plot.Plot,
// *EventDisplay, Grid.
type Figure interface {
	Draw(c draw.Canvas)
}

// Format is an output file format.
type Format int

// The output formats.
const (
	PNG Format = iota + 1
	SVG
)

// FormatOf returns the format named by the extension of path (.png or .svg,
// any case).
func FormatOf(path string) (Format, error) {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".png":
		return PNG, nil
	case ".svg":
		return SVG, nil
	}
	return 0, fmt.Errorf("display: file %q: extension must be .png or .svg", path)
}

// PixelSize returns the pixel dimensions of a PNG of the given size.
func PixelSize(width, height vg.Length) (w, h int) {
	return int(math.Round(float64(width/vg.Inch) * PNGDPI)), int(math.Round(float64(height/vg.Inch) * PNGDPI))
}

func checkSize(width, height vg.Length) error {
	for _, s := range []struct {
		name string
		v    vg.Length
	}{{"width", width}, {"height", height}} {
		if !(s.v > 0) || math.IsInf(float64(s.v), 1) || s.v > 100*vg.Inch {
			return fmt.Errorf("display: %s = %v must be positive and at most 100 inches", s.name, float64(s.v))
		}
	}
	return nil
}

// Write draws f on a canvas of the given size and writes it to w in format.
func Write(w io.Writer, f Figure, width, height vg.Length, format Format) error {
	if f == nil {
		return fmt.Errorf("display: Write: nil figure")
	}
	if err := checkSize(width, height); err != nil {
		return err
	}
	if p, ok := f.(*plot.Plot); ok {
		f = Grid{Rows: 1, Cols: 1, Plots: []*plot.Plot{p}} // legend off the data
	}
	switch format {
	case PNG:
		c := vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(PNGDPI), vgimg.UseBackgroundColor(paper))
		f.Draw(draw.New(c))
		_, err := vgimg.PngCanvas{Canvas: c}.WriteTo(w)
		return err
	case SVG:
		c := vgsvg.New(width, height)
		dc := draw.New(c)
		dc.SetColor(paper)
		dc.Fill(dc.Rectangle.Path())
		f.Draw(dc)
		_, err := c.WriteTo(w)
		return err
	}
	return fmt.Errorf("display: format = %d is not PNG or SVG", format)
}

// Save writes f to path as PNG or SVG (by the extension) atomically: the
// figure is written to a temporary file in the same directory, which is
// renamed to path when complete; on error nothing is left under path.
func Save(path string, f Figure, width, height vg.Length) error {
	format, err := FormatOf(path)
	if err != nil {
		return err
	}
	return safefile.Write(path, func(w io.Writer) error { return Write(w, f, width, height, format) })
}
