package geom

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/spatial/kdtree"
)

// Test helpers that do not share code with the package: they are the
// independent side of the brute-force comparisons.

// randomInside draws a point uniformly inside the sensor cylinder.
func randomInside(rng *rand.Rand, r, h float64) r3.Vector {
	rho := r * math.Sqrt(rng.Float64())
	phi := 2 * math.Pi * rng.Float64()
	return r3.Vector{X: rho * math.Cos(phi), Y: rho * math.Sin(phi), Z: h * (2*rng.Float64() - 1)}
}

// randomDirection draws an isotropic unit vector.
func randomDirection(rng *rand.Rand) r3.Vector {
	cz := 2*rng.Float64() - 1
	sz := math.Sqrt(1 - cz*cz)
	phi := 2 * math.Pi * rng.Float64()
	return r3.Vector{X: sz * math.Cos(phi), Y: sz * math.Sin(phi), Z: cz}
}

// randomWallPoint draws a point uniformly (per unit area) on the sensor
// surface and returns it with its part.
func randomWallPoint(rng *rand.Rand, r, h float64) (r3.Vector, Surface) {
	barrel := 2 * math.Pi * r * 2 * h
	capA := math.Pi * r * r
	x := rng.Float64() * (barrel + 2*capA)
	if x < barrel {
		phi := 2*math.Pi*rng.Float64() - math.Pi
		return r3.Vector{X: r * math.Cos(phi), Y: r * math.Sin(phi), Z: h * (2*rng.Float64() - 1)}, Barrel
	}
	rho := r * math.Sqrt(rng.Float64())
	phi := 2 * math.Pi * rng.Float64()
	p := r3.Vector{X: rho * math.Cos(phi), Y: rho * math.Sin(phi), Z: h}
	if x < barrel+capA {
		return p, Top
	}
	p.Z = -h
	return p, Bottom
}

// unrolled maps a point of part s to plane coordinates in which distance
// along the surface is Euclidean: (r phi, z) on the barrel, (x, y) on a cap.
func unrolled(p r3.Vector, s Surface, r float64) kdtree.Point {
	if s == Barrel {
		return kdtree.Point{r * math.Atan2(p.Y, p.X), p.Z}
	}
	return kdtree.Point{p.X, p.Y}
}

// surfaceTrees holds one k-d tree per surface part over the unrolled
// photocathode centres. Barrel sensors within one diameter of the seam at
// phi = +-pi are also entered shifted by a full turn, so that nearest
// neighbours across the seam are found.
type surfaceTrees struct {
	trees map[Surface]*kdtree.Tree
	index map[[3]float64]int // (part, u, v) -> sensor index
}

func newSurfaceTrees(sensors []Sensor, r, diameter float64) surfaceTrees {
	pts := map[Surface]kdtree.Points{}
	st := surfaceTrees{trees: map[Surface]*kdtree.Tree{}, index: map[[3]float64]int{}}
	add := func(s Surface, p kdtree.Point, i int) {
		pts[s] = append(pts[s], p)
		st.index[[3]float64{float64(s), p[0], p[1]}] = i
	}
	turn := 2 * math.Pi * r
	for _, s := range sensors {
		p := unrolled(s.Pos, s.Surface, r)
		add(s.Surface, p, s.Index)
		if s.Surface == Barrel {
			if p[0] > turn/2-diameter {
				add(Barrel, kdtree.Point{p[0] - turn, p[1]}, s.Index)
			}
			if p[0] < -turn/2+diameter {
				add(Barrel, kdtree.Point{p[0] + turn, p[1]}, s.Index)
			}
		}
	}
	for s, p := range pts {
		st.trees[s] = kdtree.New(p, false)
	}
	return st
}

// nearest returns the sensor nearest q on part s and its surface distance.
func (st surfaceTrees) nearest(q kdtree.Point, s Surface) (int, float64) {
	t := st.trees[s]
	if t == nil {
		return -1, math.Inf(1)
	}
	c, d2 := t.Nearest(q)
	p := c.(kdtree.Point)
	return st.index[[3]float64{float64(s), p[0], p[1]}], math.Sqrt(d2)
}

// nearestOther returns the distance from sensor i at q to the nearest other
// sensor on part s.
func (st surfaceTrees) nearestOther(q kdtree.Point, s Surface, i int) float64 {
	keep := kdtree.NewNKeeper(3)
	st.trees[s].NearestSet(keep, q)
	best := math.Inf(1)
	for _, c := range keep.Heap {
		if c.Comparable == nil {
			continue
		}
		p := c.Comparable.(kdtree.Point)
		if st.index[[3]float64{float64(s), p[0], p[1]}] != i {
			best = math.Min(best, math.Sqrt(c.Dist))
		}
	}
	return best
}

// checkErr reports err unless it matches want: nil for want "", otherwise an
// error whose text contains want.
func checkErr(t *testing.T, name string, err error, want string) {
	t.Helper()
	switch {
	case want == "" && err != nil:
		t.Errorf("%s: unexpected error %v", name, err)
	case want != "" && (err == nil || !strings.Contains(err.Error(), want)):
		t.Errorf("%s: error %v, want one containing %q", name, err, want)
	}
}
