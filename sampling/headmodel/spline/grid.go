package spline

import (
	"math"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// DefaultEdge is the polar angle from the vertex (radians) drawn at the
// rim of a Grid: 90°, the level of the nasion, inion and preauricular
// points in the 10-10 construction of package headmodel, so that the 10 %
// ring (Fpz, T7, Oz, …) sits at 0.8 of the disk radius.
const DefaultEdge = math.Pi / 2

type gridKey struct {
	size int
	edge float64
}

// gridBasis holds the kernel values of every pixel inside the disk.
type gridBasis struct {
	pix []int     // row-major pixel indices inside the disk
	g   []float64 // len(pix) × len(electrodes)
}

// Grid interpolates v onto a size×size top view of the head with rim at
// DefaultEdge; see GridEdge.
func (ip *Interpolator) Grid(values []float64, size int) ([][]float64, error) {
	return ip.GridEdge(values, size, DefaultEdge)
}

// GridEdge interpolates v onto a size×size image of the head seen from
// above in the azimuthal equidistant projection centred on the vertex:
// the distance of a pixel from the image centre is proportional to the
// polar angle from the vertex, the rim of the disk being the angle edge.
// Row 0 is anterior (nose up), column 0 is the left side (x < 0). Pixels
// outside the disk are NaN. Kernel values per pixel are cached for each
// (size, edge), so repeated maps cost one matrix–vector product.
func (ip *Interpolator) GridEdge(values []float64, size int, edge float64) ([][]float64, error) {
	if size <= 0 {
		return nil, &Error{Field: "size", Index: -1, Msg: "must be positive"}
	}
	if !(edge > 0 && edge <= math.Pi) {
		return nil, &Error{Field: "edge", Index: -1, Msg: "must be in (0, π]"}
	}
	c, err := ip.Fit(values)
	if err != nil {
		return nil, err
	}
	b := ip.basis(size, edge)
	flat := make([]float64, size*size)
	for i := range flat {
		flat[i] = math.NaN()
	}
	n := len(ip.el)
	for k, p := range b.pix {
		s := c.C0
		row := b.g[k*n : (k+1)*n]
		for i, ci := range c.C {
			s += ci * row[i]
		}
		flat[p] = s
	}
	out := make([][]float64, size)
	for i := range out {
		out[i] = flat[i*size : (i+1)*size]
	}
	return out, nil
}

// PixelDirection returns the unit vector drawn at pixel (row, col) of a
// size×size GridEdge image, and whether the pixel is inside the disk.
func PixelDirection(row, col, size int, edge float64) (headmodel.Vec3, bool) {
	u := 2*(float64(col)+0.5)/float64(size) - 1
	w := 1 - 2*(float64(row)+0.5)/float64(size)
	rho := math.Hypot(u, w)
	if rho > 1 {
		return headmodel.Vec3{}, false
	}
	th := rho * edge
	az := math.Atan2(u, w)
	return headmodel.Vec3{math.Sin(th) * math.Sin(az), math.Sin(th) * math.Cos(az), math.Cos(th)}, true
}

func (ip *Interpolator) basis(size int, edge float64) *gridBasis {
	key := gridKey{size, edge}
	ip.mu.Lock()
	defer ip.mu.Unlock()
	if b, ok := ip.grids[key]; ok {
		return b
	}
	b := &gridBasis{}
	for r := 0; r < size; r++ {
		for col := 0; col < size; col++ {
			d, ok := PixelDirection(r, col, size, edge)
			if !ok {
				continue
			}
			b.pix = append(b.pix, r*size+col)
			for _, e := range ip.el {
				b.g = append(b.g, kernel(ip.w, d.Dot(e)))
			}
		}
	}
	ip.grids[key] = b
	return b
}
