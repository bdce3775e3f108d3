package geom

import (
	"bytes"
	"math"
	"regexp"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
)

// csvErrorForm is the form every ReadSensorCSV error takes: the reader's
// name for its input and the line the problem is on.
var csvErrorForm = regexp.MustCompile(`^geom: sensor CSV line [0-9]+: `)

// FuzzReadSensorCSV feeds arbitrary text to the sensor-layout reader. It
// must never panic; every error names a line; a layout it accepts must
// write and read back to the identical detector.
func FuzzReadSensorCSV(f *testing.F) {
	const head = "@format conelight-sensors 1\n@tank_radius 560\n@tank_height 1160\n@sensor_offset 60\n@cathode_diameter 50\nx,y,z,dx,dy,dz\n"
	f.Add(head)
	f.Add(head + "500,0,0,-1,0,0\n\n# comment\n 0 , 0 , 520 , 0 , 0 , -1 \n")
	f.Add(head + "500,0,0,-1,0,0\n500,0,10,-1,0,0\n")
	f.Add(head + "500,0,0,NaN,0,0\n")
	f.Add(head + "500,0,0,-Inf,0,0\n")
	f.Add(head + "0,0,-520,0,0,1e308\n")
	f.Add(strings.Replace(head, "560", "1e300", 1))
	f.Add(strings.Replace(head, "@sensor_offset 60", "@sensor_offset NaN", 1))
	f.Add("")
	f.Add("@format conelight-sensors 1\n")
	small, err := Layout(Tank{Radius: 120, Height: 300, SensorOffset: 10}, 20, 0.1)
	if err != nil {
		f.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteSensorCSV(&buf, small); err != nil {
		f.Fatal(err)
	}
	f.Add(buf.String())

	f.Fuzz(func(t *testing.T, text string) {
		d, err := ReadSensorCSV(strings.NewReader(text))
		if err != nil {
			if !csvErrorForm.MatchString(err.Error()) {
				t.Fatalf("error %q does not name a line", err)
			}
			return
		}
		var out bytes.Buffer
		if err := WriteSensorCSV(&out, d); err != nil {
			t.Fatal(err)
		}
		back, err := ReadSensorCSV(&out)
		if err != nil {
			t.Fatalf("re-reading a written layout: %v\n%s", err, out.String())
		}
		sameDetector(t, back, d)
	})
}

// FuzzIntersect sends arbitrary rays, including NaN, Inf and zero
// components, at a detector. Nothing may panic; the distance is never
// negative or NaN; SensorAt never returns an index outside [-1, N); and a
// ray from inside along a near-unit direction leaves through the surface.
func FuzzIntersect(f *testing.F) {
	d, err := Layout(DemoTank(), 20, 0.3)
	if err != nil {
		f.Fatal(err)
	}
	inf, nan := math.Inf(1), math.NaN()
	f.Add(0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 1)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 1.0, 2)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, -1.0, 3)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 1)
	f.Add(500.0, 0.0, 520.0, 0.6, 0.0, 0.8, 2)
	f.Add(nan, 0.0, 0.0, 1.0, 0.0, 0.0, 1)
	f.Add(0.0, 0.0, 0.0, inf, 0.0, 0.0, 1)
	f.Add(-inf, inf, 0.0, 1.0, 0.0, 0.0, 0)
	f.Add(1e308, -1e308, 1e308, 0.6, 0.8, 0.0, 7)
	f.Add(0.0, 0.0, 0.0, 1e-160, 0.0, 0.0, -1)
	r, h := d.Tank().SensorRadius(), d.Tank().SensorHalfHeight()
	n := d.NumSensors()

	f.Fuzz(func(t *testing.T, px, py, pz, ux, uy, uz float64, surface int) {
		p, u := r3.Vector{X: px, Y: py, Z: pz}, r3.Vector{X: ux, Y: uy, Z: uz}
		dist, s := d.Intersect(p, u)
		if math.IsNaN(dist) || dist < 0 {
			t.Fatalf("Intersect(%v, %v) = %v", p, u, dist)
		}
		if s < NoSurface || s > Bottom || (s == NoSurface) != math.IsInf(dist, 1) {
			t.Fatalf("Intersect(%v, %v) = %v, %v", p, u, dist, s)
		}
		if s != NoSurface {
			q := p.Add(u.Mul(dist))
			if i := d.SensorAt(q, s); i < -1 || i >= n {
				t.Fatalf("SensorAt(%v, %v) = %d with %d sensors", q, s, i, n)
			}
		}
		// Any point, any surface code, even one that is not a part.
		if i := d.SensorAt(p, Surface(surface)); i < -1 || i >= n {
			t.Fatalf("SensorAt(%v, %d) = %d with %d sensors", p, surface, i, n)
		}
		_ = d.DistanceToWall(p)
		_ = d.DistanceAlong(p, u)

		n2 := u.Norm2()
		if !d.Contains(p) || !(math.Abs(n2-1) < 0.5) {
			return
		}
		if math.IsInf(dist, 1) {
			t.Fatalf("ray from inside %v along %v never leaves", p, u)
		}
		// The exit point lies on the surface to rounding of p + dist*u,
		// a few ulps of the tank size (common practice: 1e-9 relative).
		q := p.Add(u.Mul(dist))
		if w := d.DistanceToWall(q); math.Abs(w) > 1e-9*(r+h) {
			t.Fatalf("exit point %v of the ray from %v along %v is %v cm from the wall", q, p, u, w)
		}
	})
}

// TestGridCellsBounded checks the lookup grid of a long thin sensor
// surface: a barrel of radius MaxTankSize and height 2 cm would need
// millions of one-diameter cells; the grid must stay within its 8n+64
// cells (found by FuzzReadSensorCSV as a runaway allocation, then with
// radii up to 1e300, which Validate now refuses).
func TestGridCellsBounded(t *testing.T) {
	for _, tank := range []Tank{{Radius: MaxTankSize, Height: 2}, {Radius: 1, Height: MaxTankSize}, {Radius: MaxTankSize, Height: MaxTankSize}} {
		d, err := NewDetector(tank, 1, nil)
		if err != nil {
			t.Fatal(err)
		}
		for _, g := range []*grid{&d.barrel, &d.top, &d.bottom} {
			if g.nu < 1 || g.nv < 1 || g.nu*g.nv > 64 {
				t.Errorf("%v: grid of %d x %d cells, want 1 .. 64", tank, g.nu, g.nv)
			}
		}
		if i := d.SensorAt(r3.Vector{X: 1}, Barrel); i != -1 {
			t.Errorf("%v: SensorAt on an empty detector = %d", tank, i)
		}
	}
}
