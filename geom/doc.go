// Package geom describes the detector geometry: an upright cylindrical
// water tank, the photosensors on its inner (sensor) surface, and the
// geometric queries the simulation and the reconstruction make of them. It
// contains no physics.
//
// Lengths are in cm. The tank is centred at the origin with its axis along
// z. The sensor surface, on which the photocathodes lie, is the closed
// cylinder of radius r = Tank.Radius - Tank.SensorOffset and half height
// h = Tank.Height/2 - Tank.SensorOffset; it has three parts, the Barrel and
// the Top and Bottom caps. A photocathode is a disk of diameter D on its
// part: on the barrel measured along the surface (arc length r dphi and dz),
// on a cap in x and y. The coverage of a detector is N pi (D/2)^2 divided by
// the sensor surface area.
//
// A Detector is built from a Tank either by Layout, which spreads sensors
// evenly to reach a requested coverage, or by NewDetector from an explicit
// list (for example read from a file with LoadSensorCSV). DemoTank and
// LargeTank are two invented scenarios, a 10 m class and a 40 m class tank.
//
// # Ray queries
//
// Detector.Intersect gives the distance from a point inside along a unit
// direction to the sensor surface and the part it meets; Detector.SensorAt
// then says which photocathode, if any, that wall point falls on, in
// constant time through a uniform grid over (phi, z) on the barrel and
// (x, y) on each cap whose cells list the few sensors overlapping them.
// Neither allocates or makes interface calls; together they are the hot path
// of photon transport. DistanceToWall and DistanceAlong are the fiducial
// distances.
//
// # Sensor layout file
//
// LoadSensorCSV, ReadSensorCSV, SaveSensorCSV and WriteSensorCSV use a
// text format of this package's design. Lines are trimmed of surrounding
// white space; blank lines and lines starting with '#' are comments and may
// appear anywhere. Before the header row come directive lines, each
// '@name value', every one required exactly once:
//
//	@format conelight-sensors 1
//	@tank_radius 560        Tank.Radius, cm
//	@tank_height 1160       Tank.Height, cm
//	@sensor_offset 60       Tank.SensorOffset, cm
//	@cathode_diameter 50    photocathode diameter D, cm
//
// (the notes after the values are not part of the format). Then the header
// row
//
//	x,y,z,dx,dy,dz
//
// and one row per sensor, in index order: the photocathode centre x, y, z
// (cm) and the facing direction dx, dy, dz (normalized on reading), as
// decimal numbers separated by commas, for example
//
//	500,0,-494.0,-1,0,0
//
// The surface part of each sensor is worked out from its position. Reading
// checks everything NewDetector checks; errors give the line, as in
// `geom: sensors.csv line 7: field dz: "abc" is not a number`. Writing uses
// the shortest decimal form that reads back to the same float64, so a
// written layout reads back identical; SaveSensorCSV replaces the file
// atomically (temporary file in the same directory, then rename).
//
// # Concurrency
//
// Tank is a plain value. A Detector is immutable after construction and safe
// for concurrent use by multiple goroutines.
package geom
