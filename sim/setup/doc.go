// Package setup holds the one description of a detector that the
// simulator and both fitters are built from: the tank and its sensors
// (geom.Detector), the sensors' response (pmt.Model), the water's optics
// (optics.Water), the liner between the sensors, the sensors out of
// service and the trigger with its readout window.
//
// The simulator (sim.New), the low-energy fitter (fit/lowenergy.New) and
// the ring fitter (fit/ring.New) all take a Setup and apply the same
// defaults, in one place: Setup.Check.
//
// The package imports the detector description (geom, pmt) and the water
// optics (sim/optics) only, so the reconstruction may import it without
// importing the simulator.
//
// A Setup is a value; the detector and water it points to are immutable
// after construction, so a Setup may be shared by any number of
// goroutines.
//
// # Description files
//
// A Setup is written down in a description file that a physicist edits by
// hand, stores beside a study and hands to a colleague: Load and Parse
// read one, Save and Encode write one. The built-in tanks (Demo, Large)
// are such files, embedded (builtin/*.toml), read by the same parser.
//
// The format is TOML (toml.io), read with github.com/BurntSushi/toml. TOML
// because the file is written by people: comments are allowed (JSON has
// none), there is one obvious way to write a number, a string or a list
// (YAML has several, and reads "no" or 1e3 as things nobody meant), and
// tables map one to one onto the parts of a detector. Keys carry their
// unit in their name (vessel_radius_cm, tts_sigma_ns, dark_rate_hz) or, for
// plain numbers, are fractions or factors; every key has a documented
// default except the tank's size and the layout, which are required.
//
// An example with every key and its meaning is testdata/setup/example.toml;
// Encode writes the same explanation as a comment above each key it
// writes. The tables and keys:
//
//	format_version, name                  top level
//	[tank]     vessel_radius_cm, vessel_height_cm, sensor_offset_cm
//	[sensor]   preset, name, cathode_diameter_cm, qe_peak,
//	           qe_wavelength_nm + qe_fraction, collection_efficiency,
//	           acceptance_cos_incidence + acceptance_relative,
//	           tts_sigma_ns, spe_width, spe_low_fraction, spe_low_mean_pe,
//	           dark_rate_hz, threshold_pe, gate_ns, saturation_pe
//	[layout]   coverage | sensor_csv, dead_sensors
//	[water]    temperature_c, band_lo_nm, band_hi_nm, absorption_scale,
//	           rayleigh_scale, mie_length_cm, mie_wavelength_nm,
//	           mie_exponent, mie_g, attenuation_length_cm,
//	           attenuation_wavelength_nm
//	[liner]    reflectivity, diffuse_fraction
//	[trigger]  hits, window_ns, pre_trigger_ns, post_trigger_ns
//
// The tank is the water vessel (vessel_radius_cm, vessel_height_cm); the
// photocathodes lie sensor_offset_cm inside its wall, on the cylinder of
// radius vessel_radius_cm - sensor_offset_cm (geom.Tank).
//
// The sensor is a preset by name (pmt.Preset) whose fields the other keys
// of [sensor] replace; qe_peak rescales the preset's QE curve. A sensor
// that differs from its preset is renamed (preset name + " (edited)", or
// the name given), never left under the preset's name. Without a preset
// every key of [sensor] must be given.
//
// The layout is either a coverage, spread evenly by geom.Layout, or a
// sensor CSV (geom.ReadSensorCSV format) found relative to the
// description, whose tank and cathode diameter must equal the
// description's. A coverage above what the sensors can reach in the tank,
// or one that asks for more than MaxSensors sensors, is an error.
//
// Reading is strict: an unknown key, a value of the wrong type or outside
// its range, a missing required key and a layout that does not fit the
// tank are errors (*Error) that name the key, its line and the allowed
// values; all problems of a file are reported together.
//
// Encode writes the canonical form: the keys that differ from their
// defaults, the sensor as its nearest preset plus edits, the layout as the
// shortest coverage from which geom.Layout rebuilds exactly the same
// sensors (or, by Save, a sensor CSV beside the description). Parsing the
// canonical form gives back an equal Setup, and encoding that gives back
// the same bytes.
package setup
