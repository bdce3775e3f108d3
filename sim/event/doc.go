// Package event holds the value types of a simulated event (Event, Truth,
// Track, Interaction, RunInfo) and reads and writes event files: ROOT files,
// written and read with groot, that carry the events together with the
// detector, the sensor model and the run settings that made them, so that
// a file describes itself.
//
// Units: cm, ns, MeV (Q2 in MeV^2); charges in pe; wavelengths in nm;
// dark rate in Hz.
//
// # Writing, reading, merging
//
// Create starts a file; Writer.Write appends one event at a time (events
// are streamed to disk basket by basket, never collected in memory);
// Writer.Close finishes it. The file is written under the temporary name
// .NAME.tmp in the destination directory (geom/safefile), synced and
// renamed to NAME only by a successful Close, so a crash or an error never
// leaves a partial file under the final name; Writer.Abort discards it.
// A run that stops early says so before Close (Writer.Interrupt: the file
// is flagged interrupted and the rest of its range recorded missing); a
// generator file's accounting goes in with Writer.SetSource.
//
// Files are reproducible: the same events and run description give the
// same bytes, whenever written. groot's dates of writing are replaced by
// one date, SOURCE_DATE_EPOCH (seconds since 1970) when set, else
// 1995-01-01 (dates.go), and the temporary name stored in the file holds
// nothing random.
//
// Independent readers: the StreamerInfo record lists every class the
// file stores, leaf classes included (streamers.go), so that readers
// without ROOT's compiled dictionaries decode every branch; the test
// suite reads a fresh file with jsroot and compares every value.
//
// Open reads the description and checks it (the detector is rebuilt with
// geom.NewDetector, the sensor model with pmt.NewCurve and validated);
// Reader.Events, Reader.Range and Reader.Event return the events as the
// same Go values that were written (empty lists come back nil).
//
// Merge joins the shard files of one run: they must agree on the detector,
// the sensor model and every run setting but the shard's place in the run,
// no two may share a shard index or overlap, and the set must be complete:
// every shard present, none interrupted or missing events, the run's
// range covered. MergeWith with MergeOptions.Partial merges an incomplete
// set and records what is missing. Events are written shard by shard in
// increasing FirstEvent, each shard's in its stored order.
//
// # Damaged files
//
// Every entry of every tree carries a CRC-32C of its values, and the
// byte region holding the trees is covered by chunk checksums that the
// reader verifies before groot decodes those bytes; the ROOT skeleton
// outside that region (header, key list, streamer information) is checked
// for sane sizes and, where compressed, for its zlib Adler-32 sum before
// groot opens the file. A truncated or damaged file therefore gives an
// error naming the file, never a panic, a runaway allocation or silently
// changed data; panics inside groot's decoder are recovered as errors as
// well. See integrity.go and preflight.go.
//
// # File layout (format "conelight-events", version 2)
//
// Version 2 (this one) added to the events tree the interaction columns
// process, weight, source_event and from_file and renamed nu_energy to
// nu_etot; to the run tree run_first, run_events, interrupted, the
// missing spans and the source accounting; the run tree is written last.
// Open reads versions 1 and 2 (version 1's missing columns read as zero,
// its Run span as unknown unless the file is a whole run).
//
// Four trees and one string object. All names are of this package's
// design. Integer codes: PDG Monte Carlo numbering for particles; Fate
// codes as listed at the phys.Fate constants; sensor surfaces as geom.Surface
// (1 barrel, 2 top, 3 bottom). Every tree ends with a branch crc32c
// (uint32): the CRC-32C (Castagnoli) of the entry's other branches in
// order, each little-endian, strings and arrays preceded by their length
// as uint64, bools as one byte.
//
// Tree "events", one entry per event. Arrays are variable-length with the
// count branch named in brackets.
//
//	branch                 type          unit    content
//	number                 uint64                Event.Number
//	n_primary              int32                 number of primaries
//	primary_pdg            int32[n]              PDG code
//	primary_x, _y, _z      float64[n]    cm      start position
//	primary_dx, _dy, _dz   float64[n]            unit direction
//	primary_t              float64[n]    ns      start time
//	primary_ekin           float64[n]    MeV     kinetic energy
//	primary_parent         int32[n]              parent track number (0)
//	primary_track          int32[n]              track number
//	n_track                int32                 number of track summaries
//	track_pdg              int32[n]              PDG code
//	track_length           float64[n]    cm      path length
//	track_range            float64[n]    cm      start-to-end distance
//	track_fate             int32[n]              Fate code
//	track_decay_time       float64[n]    ns      decay/capture time, 0 if none
//	track_visible_photons  float64[n]            Cherenkov photons before pre-scaling (expectation)
//	track_secondaries      int32[n]              secondaries produced
//	photons                int64                 photons traced (after pre-scaling)
//	pe                     int64                 signal photoelectrons
//	pe_dark                int64                 dark photoelectrons
//	pe_direct              int64                 signal pe from unscattered light
//	pe_scattered           int64                 signal pe from light scattered in water
//	pe_reflected           int64                 signal pe from reflected light
//	triggered              bool                  trigger fired
//	trigger_time           float64       ns      trigger time (0 if not fired)
//	nu_pdg                 int32                 incoming neutrino PDG code (0: no interaction)
//	nu_etot                float64       MeV     its total energy
//	nu_dx, nu_dy, nu_dz    float64               its unit direction
//	nu_q2                  float64       MeV^2   four-momentum transfer squared
//	nu_target              int32                 target PDG code (nucleus 100ZZZAAAI or 2212)
//	process                int32                 process ID, NuHepMC numbering (0: unknown)
//	weight                 float64               event weight (1: unweighted, 0: no interaction)
//	source_event           int64                 event number in the generator's file
//	from_file              bool                  the event came from a generator file
//	nucleon_pdg ... nucleon_track                outgoing nucleon, the 11 fields of a
//	                                             primary (scalars: x, y, z, dx, dy, dz, t, ekin,
//	                                             parent, track)
//	n_hit                  int32                 number of hits
//	hit_sensor             int32[n]              sensor index, 0 .. n_sensor-1
//	hit_time               float64[n]    ns      hit time
//	hit_charge             float64[n]    pe      integrated charge
//	crc32c                 uint32                entry checksum
//
// Tree "detector", one entry (geom.Detector):
//
//	tank_radius, tank_height  float64        cm   vessel inner radius and height
//	sensor_offset             float64        cm   depth of the sensor surface inside the wall
//	cathode_diameter          float64        cm   photocathode diameter
//	n_sensor                  int32               number of sensors
//	sensor_x, _y, _z          float64[n]     cm   photocathode centres, in index order
//	sensor_dx, _dy, _dz       float64[n]          unit facing directions (into the tank)
//	sensor_surface            int32[n]            geom.Surface code
//	crc32c                    uint32
//
// Tree "sensor", one entry (pmt.Model):
//
//	name                      string
//	cathode_diameter          float64        cm
//	n_qe                      int32               QE curve points
//	qe_wavelength, qe         float64[n]     nm, 1   quantum efficiency curve
//	collection_efficiency     float64
//	n_acceptance              int32               acceptance curve points
//	acceptance_cos, acceptance float64[n]         relative acceptance vs cos(incidence)
//	tts                       float64        ns   transit-time spread (Gaussian sigma)
//	spe_width                 float64             single-pe relative width
//	spe_low_fraction          float64             weight of the low-charge component
//	spe_low_mean              float64        pe   mean of the low-charge component
//	dark_rate                 float64        Hz
//	threshold                 float64        pe
//	integration_window        float64        ns
//	saturation                float64        pe   0: none
//	crc32c                    uint32
//
// Tree "run", one entry (RunInfo and the format identification):
//
//	format                    string              "conelight-events"
//	format_version            int32               2
//	seed                      uint64
//	generator, version, water, options  string    descriptions in the simulator's words
//	shard_index, shard_count  int32
//	first_event, events       uint64              event numbers first_event .. first_event+events-1
//	run_first, run_events     uint64              the whole run's event numbers (all shards)
//	interrupted               bool                the run stopped early
//	n_missing                 int32               number of missing spans
//	missing_first, missing_n  uint64[n]           event numbers never simulated: first, count
//	source_read               uint64              events read from the generator's file
//	source_skipped            uint64              of them, not simulated
//	skip_reasons              string              one line per skipped event
//	trigger_threshold         int32               hits (0 with the other trigger fields: no trigger)
//	trigger_window            float64        ns
//	trigger_pre, trigger_post float64        ns   readout before and after the trigger time
//	keep_untriggered          bool
//	crc32c                    uint32
//
// TObjString "integrity": text lines "conelight-integrity 1", "region B E"
// (the byte range holding the trees), "chunk N" (bytes per checksum),
// "key NAME POS" for each tree record, one "crc HEX" per chunk (CRC-32C),
// and "self HEX", the CRC-32C of the preceding text.
//
// The events tree is zlib-compressed (level 1) in 128 kB baskets.
//
// # Concurrency
//
// Event values are plain data. A Writer or a Reader must not be used by
// two goroutines at once; open a file twice to read it in parallel.
package event
