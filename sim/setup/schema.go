package setup

// rawFile mirrors a description file. A nil pointer or slice is a key the
// file does not set; the parser then applies the documented default.
type rawFile struct {
	FormatVersion *int       `toml:"format_version"`
	Name          *string    `toml:"name"`
	Tank          rawTank    `toml:"tank"`
	Sensor        rawSensor  `toml:"sensor"`
	Layout        rawLayout  `toml:"layout"`
	Water         rawWater   `toml:"water"`
	Liner         rawLiner   `toml:"liner"`
	Trigger       rawTrigger `toml:"trigger"`
}

type rawTank struct {
	VesselRadius *float64 `toml:"vessel_radius_cm"`
	VesselHeight *float64 `toml:"vessel_height_cm"`
	SensorOffset *float64 `toml:"sensor_offset_cm"`
}

type rawSensor struct {
	Preset               *string   `toml:"preset"`
	Name                 *string   `toml:"name"`
	CathodeDiameter      *float64  `toml:"cathode_diameter_cm"`
	QEPeak               *float64  `toml:"qe_peak"`
	QEWavelength         []float64 `toml:"qe_wavelength_nm"`
	QEFraction           []float64 `toml:"qe_fraction"`
	CollectionEfficiency *float64  `toml:"collection_efficiency"`
	AcceptanceCos        []float64 `toml:"acceptance_cos_incidence"`
	AcceptanceRelative   []float64 `toml:"acceptance_relative"`
	TTS                  *float64  `toml:"tts_sigma_ns"`
	SPEWidth             *float64  `toml:"spe_width"`
	SPELowFraction       *float64  `toml:"spe_low_fraction"`
	SPELowMean           *float64  `toml:"spe_low_mean_pe"`
	DarkRate             *float64  `toml:"dark_rate_hz"`
	Threshold            *float64  `toml:"threshold_pe"`
	Gate                 *float64  `toml:"gate_ns"`
	Saturation           *float64  `toml:"saturation_pe"`
}

type rawLayout struct {
	Coverage  *float64 `toml:"coverage"`
	SensorCSV *string  `toml:"sensor_csv"`
	Dead      []int    `toml:"dead_sensors"`
}

type rawWater struct {
	Temperature           *float64 `toml:"temperature_c"`
	BandLo                *float64 `toml:"band_lo_nm"`
	BandHi                *float64 `toml:"band_hi_nm"`
	AbsorptionScale       *float64 `toml:"absorption_scale"`
	RayleighScale         *float64 `toml:"rayleigh_scale"`
	MieLength             *float64 `toml:"mie_length_cm"`
	MieWavelength         *float64 `toml:"mie_wavelength_nm"`
	MieExponent           *float64 `toml:"mie_exponent"`
	MieG                  *float64 `toml:"mie_g"`
	AttenuationLength     *float64 `toml:"attenuation_length_cm"`
	AttenuationWavelength *float64 `toml:"attenuation_wavelength_nm"`
}

type rawLiner struct {
	Reflectivity    *float64 `toml:"reflectivity"`
	DiffuseFraction *float64 `toml:"diffuse_fraction"`
}

type rawTrigger struct {
	Hits        *int     `toml:"hits"`
	Window      *float64 `toml:"window_ns"`
	PreTrigger  *float64 `toml:"pre_trigger_ns"`
	PostTrigger *float64 `toml:"post_trigger_ns"`
}

// keyDoc documents one key of the file: what it is, its unit, its allowed
// values and its default. Encode writes the text as a comment above the
// key; the package documentation and testdata/setup/example.toml say the
// same.
type keyDoc struct {
	key, doc string
}

// schema lists every key of a description file in the order Encode writes
// them; sections are the keys without a dot that have keys below them.
func schema() []keyDoc {
	return []keyDoc{
		{"format_version", "format of this file; 1, the only one (default 1)"},
		{"name", "label of the detector, stored in event files (default: the file name without extension)"},

		{"tank.vessel_radius_cm", "inner radius of the water vessel, cm (required)"},
		{"tank.vessel_height_cm", "inner height of the water vessel, cm (required)"},
		{"tank.sensor_offset_cm", "depth of the photocathode surface inside the vessel wall, cm: the sensors lie on the cylinder of radius vessel_radius_cm - sensor_offset_cm and height vessel_height_cm - 2 sensor_offset_cm (default 0)"},

		{"sensor.preset", "sensor preset the other keys of [sensor] edit: Large, Medium or Small (pmt.Preset); without a preset every other key of [sensor] is required"},
		{"sensor.name", "sensor model name (default: the preset's name, or the preset's name + \" (edited)\" when the keys below change it, or \"custom\" without a preset); a preset's name is refused for a sensor that differs from that preset"},
		{"sensor.cathode_diameter_cm", "photocathode diameter, cm, > 0 (default: preset)"},
		{"sensor.qe_peak", "peak quantum efficiency in (0, 1]: the preset's QE curve scaled to this maximum; not with qe_fraction (default: preset)"},
		{"sensor.qe_wavelength_nm", "wavelengths of the quantum-efficiency table, nm, increasing, at least 2 (default: preset)"},
		{"sensor.qe_fraction", "quantum efficiency in [0, 1] at each qe_wavelength_nm; linear in between, 0 outside (default: preset)"},
		{"sensor.collection_efficiency", "probability in (0, 1] that a photoelectron reaches the first dynode (default: preset)"},
		{"sensor.acceptance_cos_incidence", "cosines of the incidence angle of the angular-acceptance table, increasing, within [-1, 1] (default: preset)"},
		{"sensor.acceptance_relative", "relative acceptance in [0, 1] (largest in (0, 1]) at each acceptance_cos_incidence, over and above the cathode's projected area (default: preset)"},
		{"sensor.tts_sigma_ns", "transit-time spread, Gaussian sigma (not FWHM), ns, >= 0 (default: preset)"},
		{"sensor.spe_width", "relative rms width of the single-photoelectron charge peak, in [0, 1] (default: preset)"},
		{"sensor.spe_low_fraction", "fraction of single photoelectrons in the exponential low-charge tail, in [0, 1) (default: preset)"},
		{"sensor.spe_low_mean_pe", "mean charge of the low-charge tail, pe, > 0 when spe_low_fraction > 0 (default: preset)"},
		{"sensor.dark_rate_hz", "dark-pulse rate of one sensor, Hz, >= 0 (default: preset)"},
		{"sensor.threshold_pe", "smallest integrated charge that makes a hit, pe, >= 0 (default: preset)"},
		{"sensor.gate_ns", "charge-integration gate opened by a hit, ns, > 0 (default: preset)"},
		{"sensor.saturation_pe", "largest recorded charge, pe; 0 means no limit, otherwise >= threshold_pe (default: preset)"},

		{"layout.coverage", "photocathode coverage of the sensor surface, a fraction in (0, most that fits]: sensors spread evenly by geom.Layout; give this or sensor_csv"},
		{"layout.sensor_csv", "sensor-layout CSV file (geom.ReadSensorCSV format), relative to this file; its tank and cathode diameter must equal [tank] and [sensor]; give this or coverage"},
		{"layout.dead_sensors", "indices of sensors out of service, no repeats (default: none)"},

		{"water.temperature_c", "water temperature, C, in [0, 100] (default 20)"},
		{"water.band_lo_nm", "shortest wavelength simulated, nm, in [200, 700] (default 250)"},
		{"water.band_hi_nm", "longest wavelength simulated, nm, in [200, 700], > band_lo_nm (default 700)"},
		{"water.absorption_scale", "factor on the pure-water absorption coefficient, >= 0; not with attenuation_length_cm (default 1)"},
		{"water.rayleigh_scale", "factor on the pure-water Rayleigh scattering coefficient, >= 0 (default 1)"},
		{"water.mie_length_cm", "length of the forward-peaked (Mie-like) scattering at mie_wavelength_nm, cm; 0 means none (default 0)"},
		{"water.mie_wavelength_nm", "reference wavelength of mie_length_cm, nm, > 0 (default 500)"},
		{"water.mie_exponent", "Mie length grows as (wavelength/mie_wavelength_nm)^mie_exponent (default 1)"},
		{"water.mie_g", "Henyey-Greenstein mean cosine of Mie scattering, in (-1, 1) (default 0.9)"},
		{"water.attenuation_length_cm", "total attenuation length wanted at attenuation_wavelength_nm, cm: sets the absorption scale that gives it; 0 means use absorption_scale (default 0)"},
		{"water.attenuation_wavelength_nm", "wavelength of attenuation_length_cm, nm, in [200, 700] (required with attenuation_length_cm)"},

		{"liner.reflectivity", "probability that a photon reaching the wall between the sensors is reflected, in [0, 1] (default 0.03)"},
		{"liner.diffuse_fraction", "fraction of the reflections that are diffuse (Lambertian), the rest specular, in [0, 1] (default 0.5)"},

		{"trigger.hits", "hits needed within window_ns to trigger, an integer in [1, number of sensors] (default 10)"},
		{"trigger.window_ns", "sliding trigger window, ns, > 0 (default 200)"},
		{"trigger.pre_trigger_ns", "readout before the trigger time, ns, >= 0 (default 400)"},
		{"trigger.post_trigger_ns", "readout after the trigger time, ns, >= 0 (default 1000)"},
	}
}

// sections lists the tables of a description file in the order Encode
// writes them.
func sections() []string {
	return []string{"tank", "sensor", "layout", "water", "liner", "trigger"}
}
