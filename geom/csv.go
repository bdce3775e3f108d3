package geom

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom/safefile"
)

// csvFormat is the value of the @format directive this package reads and writes.
const csvFormat = "conelight-sensors 1"

// csvHeader is the column header row.
const csvHeader = "x,y,z,dx,dy,dz"

// csvColumns names the fields of a data row, for error messages.
var csvColumns = [...]string{"x", "y", "z", "dx", "dy", "dz"}

// ReadSensorCSV reads a sensor layout in the format described in the package
// documentation and builds its detector with NewDetector. Errors give the
// line: `geom: sensor CSV line 7: field dz: "abc" is not a number`.
func ReadSensorCSV(r io.Reader) (*Detector, error) { return readSensorCSV(r, "sensor CSV") }

// LoadSensorCSV reads the sensor layout file at path; see ReadSensorCSV.
// Errors name the file: `geom: sensors.csv line 7: ...`.
func LoadSensorCSV(path string) (*Detector, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("geom: %w", err)
	}
	defer f.Close()
	return readSensorCSV(f, path)
}

func readSensorCSV(r io.Reader, name string) (*Detector, error) {
	sc := bufio.NewScanner(r)
	lineErr := func(line int, format string, args ...any) error {
		return fmt.Errorf("geom: %s line %d: %s", name, line, fmt.Sprintf(format, args...))
	}
	// Directives, with the line each was given on.
	values := map[string]float64{}
	seen := map[string]int{}
	numeric := []string{"tank_radius", "tank_height", "sensor_offset", "cathode_diameter"}
	var (
		line      int
		header    bool
		format    bool
		sensors   []Sensor
		sensorLno []int
	)
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		switch {
		case text == "" || strings.HasPrefix(text, "#"):
			continue
		case strings.HasPrefix(text, "@"):
			if header {
				return nil, lineErr(line, "directive %q after the header row", text)
			}
			key, val, _ := strings.Cut(text[1:], " ")
			val = strings.TrimSpace(val)
			if prev, dup := seen[key]; dup {
				return nil, lineErr(line, "directive @%s repeats line %d", key, prev)
			}
			seen[key] = line
			if key == "format" {
				if val != csvFormat {
					return nil, lineErr(line, "@format %q is not %q", val, csvFormat)
				}
				format = true
				continue
			}
			known := false
			for _, k := range numeric {
				known = known || k == key
			}
			if !known {
				return nil, lineErr(line, "unknown directive @%s", key)
			}
			v, err := strconv.ParseFloat(val, 64)
			if err != nil {
				return nil, lineErr(line, "directive @%s: %q is not a number", key, val)
			}
			values[key] = v
		case !header:
			if !format {
				return nil, lineErr(line, "missing @format %s before the data", csvFormat)
			}
			for _, k := range numeric {
				if _, ok := seen[k]; !ok {
					return nil, lineErr(line, "missing directive @%s before the header row", k)
				}
			}
			if strings.ReplaceAll(text, " ", "") != csvHeader {
				return nil, lineErr(line, "header row %q is not %q", text, csvHeader)
			}
			header = true
		default:
			fields := strings.Split(text, ",")
			if len(fields) != len(csvColumns) {
				return nil, lineErr(line, "%d fields, want %d (%s)", len(fields), len(csvColumns), csvHeader)
			}
			var v [len(csvColumns)]float64
			for i, f := range fields {
				f = strings.TrimSpace(f)
				x, err := strconv.ParseFloat(f, 64)
				if err != nil {
					return nil, lineErr(line, "field %s: %q is not a number", csvColumns[i], f)
				}
				v[i] = x
			}
			sensors = append(sensors, Sensor{Pos: r3.Vector{X: v[0], Y: v[1], Z: v[2]}, Dir: r3.Vector{X: v[3], Y: v[4], Z: v[5]}})
			sensorLno = append(sensorLno, line)
		}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("geom: %s line %d: %w", name, line+1, err)
	}
	if !header {
		return nil, lineErr(line+1, "end of input before the header row %q", csvHeader)
	}
	t := Tank{Radius: values["tank_radius"], Height: values["tank_height"], SensorOffset: values["sensor_offset"]}
	d, bad, err := newDetector(t, values["cathode_diameter"], sensors)
	if err != nil {
		at := seen[directiveAt(t, values["cathode_diameter"])]
		if bad >= 0 {
			at = sensorLno[bad]
		}
		return nil, lineErr(at, "%s", strings.TrimPrefix(err.Error(), "geom: "))
	}
	return d, nil
}

// directiveAt names the directive a tank or cathode-diameter error from
// newDetector is about, following the order of Tank.Validate and
// checkDiameter, so that the reader can give its line.
func directiveAt(t Tank, diameter float64) string {
	switch {
	case !positiveFinite(t.Radius):
		return "tank_radius"
	case !positiveFinite(t.Height):
		return "tank_height"
	case t.Validate() != nil:
		return "sensor_offset"
	}
	return "cathode_diameter"
}

// WriteSensorCSV writes d in the format described in the package
// documentation. Numbers are written in the shortest form that reads back
// to the same float64, so ReadSensorCSV returns an identical detector.
func WriteSensorCSV(w io.Writer, d *Detector) error {
	bw := bufio.NewWriter(w)
	t := d.Tank()
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	fmt.Fprintf(bw, "# conelight sensor layout: %d sensors, coverage %.4f\n", d.NumSensors(), d.Coverage())
	fmt.Fprintf(bw, "# lengths in cm; one row per sensor: photocathode centre x,y,z and inward facing direction dx,dy,dz\n")
	fmt.Fprintf(bw, "@format %s\n@tank_radius %s\n@tank_height %s\n@sensor_offset %s\n@cathode_diameter %s\n%s\n",
		csvFormat, g(t.Radius), g(t.Height), g(t.SensorOffset), g(d.CathodeDiameter()), csvHeader)
	for _, s := range d.sensors {
		fmt.Fprintf(bw, "%s,%s,%s,%s,%s,%s\n", g(s.Pos.X), g(s.Pos.Y), g(s.Pos.Z), g(s.Dir.X), g(s.Dir.Y), g(s.Dir.Z))
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("geom: writing sensor CSV: %w", err)
	}
	return nil
}

// SaveSensorCSV writes d to the file at path atomically: it writes a
// temporary file in the same directory and renames it over path, so a reader
// never sees a partial file.
func SaveSensorCSV(path string, d *Detector) error {
	return safefile.Write(path, func(w io.Writer) error { return WriteSensorCSV(w, d) })
}
