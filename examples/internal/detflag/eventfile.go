package detflag

import (
	"fmt"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/setup"
)

// IsEventFile reports whether a -detector value names an event file, whose
// detector Load rebuilds without dead sensors (event files do not record
// them).
func IsEventFile(spec string) bool { return strings.EqualFold(filepath.Ext(spec), ".root") }

// fromEventFile rebuilds the detector of a production from its event
// file: the detector and sensor trees give the sensors and their model,
// the run tree the trigger, the water and the liner. The file stores no
// detector name (the file's base name is used) and no list of dead
// sensors: the description has none.
//
// The run tree states the water and the liner as text (sim's
// Simulator.RunInfo); they are read back exactly, since every number is
// written in its shortest form that reads back to the same float64. A run
// tree whose text does not have that form is an error naming it, never a
// guess.
func fromEventFile(path string) (setup.Setup, error) {
	r, err := event.Open(path)
	if err != nil {
		return setup.Setup{}, err
	}
	defer r.Close()
	run := r.Run()
	w, err := waterFromRun(run.Water)
	if err != nil {
		return setup.Setup{}, fmt.Errorf("-detector %s: %w", path, err)
	}
	liner, err := linerFromRun(run.Options)
	if err != nil {
		return setup.Setup{}, fmt.Errorf("-detector %s: %w", path, err)
	}
	base := filepath.Base(path)
	s := setup.Setup{
		Name:     strings.TrimSuffix(base, filepath.Ext(base)),
		Detector: r.Detector(),
		Sensor:   r.Sensor(),
		Water:    w,
		Liner:    liner,
		Trigger:  run.Trigger,
	}
	if err := s.Check(); err != nil {
		return setup.Setup{}, fmt.Errorf("-detector %s: %w", path, err)
	}
	if err := s.CheckTrigger(); err != nil {
		return setup.Setup{}, fmt.Errorf("-detector %s: the run applied no trigger: %w", path, err)
	}
	return s, nil
}

// num is a float as %g writes it.
const num = `([-+0-9.eE]+|[-+]?Inf|NaN)`

// waterText matches the run tree's water text.
var waterText = regexp.MustCompile(`^T=` + num + ` C, band ` + num + `-` + num + ` nm, absorption x` + num +
	`, Rayleigh x` + num + `, Mie length ` + num + ` cm at ` + num + ` nm \(exponent ` + num + `, g ` + num +
	`\), attenuation length ` + num + ` cm at ` + num + ` nm$`)

// linerText matches the liner at the start of the run tree's options.
var linerText = regexp.MustCompile(`^liner reflectivity ` + num + ` \(diffuse ` + num + `\)`)

// floats parses the submatches of m after the whole match.
func floats(m []string) ([]float64, error) {
	v := make([]float64, len(m)-1)
	for i, s := range m[1:] {
		x, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return nil, err
		}
		v[i] = x
	}
	return v, nil
}

func waterFromRun(text string) (*optics.Water, error) {
	m := waterText.FindStringSubmatch(text)
	if m == nil {
		return nil, fmt.Errorf("run tree water %q is not in the form this program reads", text)
	}
	v, err := floats(m)
	if err != nil {
		return nil, fmt.Errorf("run tree water %q: %w", text, err)
	}
	c := optics.WaterConfig{
		TemperatureC: v[0], BandLo: v[1], BandHi: v[2], AbsorptionScale: v[3], RayleighScale: v[4],
		MieLength: v[5], MieWavelength: v[6], MieExponent: v[7], MieG: v[8],
		AttenuationLength: v[9], AttenuationWavelength: v[10],
	}
	if c.AttenuationLength > 0 {
		// The absorption written is the scale the attenuation length set;
		// the attenuation length sets it again, from the same optics.
		c.AbsorptionScale = optics.DefaultWaterConfig().AbsorptionScale
	}
	w, err := optics.NewWater(c)
	if err != nil {
		return nil, fmt.Errorf("run tree water %q: %w", text, err)
	}
	if c.AttenuationLength > 0 && w.AbsorptionScale() != v[3] {
		return nil, fmt.Errorf("run tree water %q: the attenuation length gives absorption x%g here, not x%g", text, w.AbsorptionScale(), v[3])
	}
	return w, nil
}

func linerFromRun(text string) (optics.Liner, error) {
	m := linerText.FindStringSubmatch(text)
	if m == nil {
		return optics.Liner{}, fmt.Errorf("run tree options %q do not start with the liner in the form this program reads", text)
	}
	v, err := floats(m)
	if err != nil {
		return optics.Liner{}, fmt.Errorf("run tree options %q: %w", text, err)
	}
	l := optics.Liner{Reflectivity: v[0], DiffuseFraction: v[1]}
	if err := l.Validate(); err != nil {
		return optics.Liner{}, fmt.Errorf("run tree options %q: %w", text, err)
	}
	return l, nil
}
