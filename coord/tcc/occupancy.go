package tcc

import (
	"math"

	"gonum.org/v1/plot/vg"
)

// occupancy records where the chart's curves run through the data area,
// on a grid of small cells, per owner (a device, or −1 for the damage
// curves), so that a label can be kept off the curves it would hide.
// Counting the cells a box covers takes four look-ups in summed tables.
type occupancy struct {
	min    vg.Point
	cell   vg.Length
	nx, ny int
	total  []int32         // summed table of every owner's cells
	owners map[int][]int32 // summed table per owner
}

// occupancyCell is the grid's cell size in points: finer than a label's
// padding, coarse enough to keep the tables small.
const occupancyCell = vg.Length(1.5)

func newOccupancy(area vg.Rectangle) *occupancy {
	o := &occupancy{min: area.Min, cell: occupancyCell, owners: map[int][]int32{}}
	o.nx = int(math.Ceil(float64((area.Max.X - area.Min.X) / o.cell)))
	o.ny = int(math.Ceil(float64((area.Max.Y - area.Min.Y) / o.cell)))
	o.nx, o.ny = max(o.nx, 1), max(o.ny, 1)
	return o
}

// add marks the cells a polyline of owner passes through.
func (o *occupancy) add(owner int, pts []vg.Point) {
	grid, ok := o.owners[owner]
	if !ok {
		grid = make([]int32, o.nx*o.ny)
		o.owners[owner] = grid
	}
	mark := func(p vg.Point) {
		i := int((p.X - o.min.X) / o.cell)
		j := int((p.Y - o.min.Y) / o.cell)
		if i >= 0 && i < o.nx && j >= 0 && j < o.ny {
			grid[j*o.nx+i] = 1
		}
	}
	for k := 0; k+1 < len(pts); k++ {
		a, b := pts[k], pts[k+1]
		n := int(math.Ceil(float64(dist(a, b)/(o.cell/2)))) + 1
		if n > 100000 {
			n = 100000 // a segment far outside the area, clipped by the grid
		}
		for s := 0; s <= n; s++ {
			f := vg.Length(float64(s) / float64(n))
			mark(vg.Point{X: a.X + f*(b.X-a.X), Y: a.Y + f*(b.Y-a.Y)})
		}
	}
}

// seal turns the marked cells into summed tables; add may not be called
// after it.
func (o *occupancy) seal() {
	o.total = make([]int32, (o.nx+1)*(o.ny+1))
	for owner, grid := range o.owners {
		sum := summed(grid, o.nx, o.ny)
		o.owners[owner] = sum
		for k := range sum {
			o.total[k] += sum[k]
		}
	}
}

// summed returns the summed-area table of a grid, (nx+1)×(ny+1).
func summed(grid []int32, nx, ny int) []int32 {
	out := make([]int32, (nx+1)*(ny+1))
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			out[(j+1)*(nx+1)+i+1] = grid[j*nx+i] + out[j*(nx+1)+i+1] + out[(j+1)*(nx+1)+i] - out[j*(nx+1)+i]
		}
	}
	return out
}

// count returns how many curve cells of owners other than except (−2:
// none excepted) box r covers.
func (o *occupancy) count(r vg.Rectangle, except int) int {
	if o == nil || o.total == nil {
		return 0
	}
	clampI := func(x vg.Length, n int) int {
		return min(max(int(math.Floor(float64(x/o.cell))), 0), n)
	}
	i0, i1 := clampI(r.Min.X-o.min.X, o.nx), clampI(r.Max.X-o.min.X+o.cell, o.nx)
	j0, j1 := clampI(r.Min.Y-o.min.Y, o.ny), clampI(r.Max.Y-o.min.Y+o.cell, o.ny)
	at := func(t []int32) int {
		w := o.nx + 1
		return int(t[j1*w+i1] - t[j0*w+i1] - t[j1*w+i0] + t[j0*w+i0])
	}
	n := at(o.total)
	if t, ok := o.owners[except]; ok {
		n -= at(t)
	}
	return n
}
