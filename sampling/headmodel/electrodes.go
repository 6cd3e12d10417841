package headmodel

import (
	"math"
	"strings"
)

// The 10-10 system on a sphere.
//
// The fiducials (nasion, inion, left and right preauricular points) lie on
// the equator z = 0, the vertex Cz on the +z pole. Following the
// proportional rule of Jasper (1958), extended to 10 % steps by Chatrian,
// Lettich & Nelson (1985), every named arc is cut into 10 % pieces:
//
//   - the midsagittal nasion–Cz–inion arc (180°) gives Nz, Fpz, AFz, Fz,
//     FCz, Cz, CPz, Pz, POz, Oz, Iz at 0, 10, …, 100 % (18° steps), so Fpz
//     and Oz are at elevation 18° and Fz lies 20 % (36°) behind Fpz;
//   - the horizontal circumference through Fpz, T7 and Oz (the 10 % ring,
//     elevation 18°) is cut in 10 % steps of the Fpz–Oz half-circumference,
//     giving Fp, AF7/8, F7/8, FT7/8, T7/8 (at 50 %), TP7/8, P7/8, PO7/8,
//     O1/2 at azimuth steps of 18°; T7/T8 are therefore also 10 % of the
//     preauricular arc above the preauricular points;
//   - the 0 % ring (the equator) carries F9/10, FT9/10, T9/10, TP9/10,
//     P9/10 below their 10 % ring neighbours, and Nz and Iz;
//   - each coronal row (AF, F, FC, C, CP, P, PO) joins its left 10 %-ring
//     electrode, its midline electrode and its right 10 %-ring electrode.
//     As in the spherical construction of Oostenveld & Praamstra (2001),
//     the row is the circle cut from the sphere by the plane through these
//     three points, and the row electrodes 5, 3, 1, z, 2, 4, 6 are spaced
//     equally along that circle (eighths of the row).
//
// The C row is a great circle (its plane contains the centre); the other
// rows are small circles, so e.g. F3 is halfway along the F7–Fz arc but the
// old sagittal Fp1–F3–C3–P3–O1 line is only approximately equally spaced.

const deg = math.Pi / 180

// sph returns the unit vector at elevation el above the equator and
// azimuth az measured from anterior (+y) towards the right (+x).
func sph(el, az float64) Vec3 {
	return Vec3{math.Cos(el) * math.Sin(az), math.Cos(el) * math.Cos(az), math.Sin(el)}
}

// midline returns the point k tenths along the nasion–inion arc.
func midline(k int) Vec3 {
	return sph(0, 0).Scale(math.Cos(float64(k) * 18 * deg)).Add(Vec3{0, 0, math.Sin(float64(k) * 18 * deg)})
}

// ring returns the point on the 10 % ring j tenths of the Fpz–Oz
// half-circumference from Fpz; j < 0 is the left side.
func ring(j int) Vec3 { return sph(18*deg, float64(j)*18*deg) }

// rowPoint returns the point at fraction f along the circle through a, b
// and c (b the arc's midpoint), measured from a.
func rowPoint(a, b, c Vec3, f float64) Vec3 {
	n := b.Sub(a).Cross(c.Sub(a)).Unit()
	centre := n.Scale(n.Dot(a))
	u := a.Sub(centre)
	w := b.Sub(centre)
	axis := u.Cross(w).Unit()
	t := 2 * u.Angle(w) * f
	// Rodrigues rotation of u about axis (axis ⟂ u).
	return centre.Add(u.Scale(math.Cos(t))).Add(axis.Cross(u).Scale(math.Sin(t)))
}

var positions1010 = build1010()

// names1010 lists the 10-10 names in a fixed front-to-back, left-to-right
// order.
var names1010 []string

func build1010() map[string]Vec3 {
	m := make(map[string]Vec3)
	add := func(name string, p Vec3) {
		names1010 = append(names1010, name)
		m[strings.ToLower(name)] = p
	}
	add("Nz", midline(0))
	add("Fp1", ring(-1))
	add("Fpz", midline(1))
	add("Fp2", ring(1))
	type row struct {
		prefix, ringL, ringR string
		j, k                 int
		numbers              []int
	}
	rows := []row{
		{"AF", "AF7", "AF8", 2, 2, []int{3, 4}},
		{"F", "F7", "F8", 3, 3, []int{5, 3, 1, 2, 4, 6}},
		{"FC", "FT7", "FT8", 4, 4, []int{5, 3, 1, 2, 4, 6}},
		{"C", "T7", "T8", 5, 5, []int{5, 3, 1, 2, 4, 6}},
		{"CP", "TP7", "TP8", 6, 6, []int{5, 3, 1, 2, 4, 6}},
		{"P", "P7", "P8", 7, 7, []int{5, 3, 1, 2, 4, 6}},
		{"PO", "PO7", "PO8", 8, 8, []int{3, 4}},
	}
	// Equator electrodes below the 10 % ring ends of rows F … P.
	outer := map[int]string{3: "F", 4: "FT", 5: "T", 6: "TP", 7: "P"}
	// Row electrode number → eighths from the left end of the row.
	eighth := map[int]float64{5: 1, 3: 2, 1: 3, 2: 5, 4: 6, 6: 7}
	for _, r := range rows {
		left, mid, right := ring(-r.j), midline(r.k), ring(r.j)
		if r.j >= 3 && r.j <= 7 {
			add(outer[r.j]+"9", sph(0, -float64(r.j)*18*deg))
		}
		add(r.ringL, left)
		for _, num := range r.numbers {
			if num%2 == 1 {
				add(r.prefix+itoa(num), rowPoint(left, mid, right, eighth[num]/8))
			}
		}
		add(r.prefix+"z", mid)
		for _, num := range r.numbers {
			if num%2 == 0 {
				add(r.prefix+itoa(num), rowPoint(left, mid, right, eighth[num]/8))
			}
		}
		add(r.ringR, right)
		if r.j >= 3 && r.j <= 7 {
			add(outer[r.j]+"10", sph(0, float64(r.j)*18*deg))
		}
	}
	add("O1", ring(-9))
	add("Oz", midline(9))
	add("O2", ring(9))
	add("Iz", midline(10))
	// Ear and mastoid references have no place in the proportional rule;
	// they are put 10 % below the preauricular point and below TP9/TP10.
	// common practice
	add("A1", sph(-18*deg, -90*deg))
	add("A2", sph(-18*deg, 90*deg))
	add("M1", sph(-18*deg, -108*deg))
	add("M2", sph(-18*deg, 108*deg))
	return m
}

func itoa(n int) string { return string(rune('0' + n)) }

// aliases maps the 10-20 names retired by the 10-10 nomenclature (Chatrian
// et al. 1985) to their 10-10 equivalents.
var aliases = map[string]string{"t3": "t7", "t4": "t8", "t5": "p7", "t6": "p8"}

// Position returns the unit-sphere position of the named 10-10 electrode
// (case-insensitive; T3/T4/T5/T6 are accepted for T7/T8/P7/P8; A1/A2/M1/M2
// are rough placements). Multiply by the scalp radius to use it with a
// Sphere.
func Position(name string) (Vec3, bool) {
	key := strings.ToLower(strings.TrimSpace(name))
	if a, ok := aliases[key]; ok {
		key = a
	}
	p, ok := positions1010[key]
	return p, ok
}

// Positions returns the positions of the named electrodes that are known,
// in order, and the names that are not.
func Positions(names []string) (pos []Vec3, missing []string) {
	for _, n := range names {
		p, ok := Position(n)
		if !ok {
			missing = append(missing, n)
			continue
		}
		pos = append(pos, p)
	}
	return pos, missing
}

// Names1010 returns the electrode names known to Position, without
// aliases.
func Names1010() []string {
	return append([]string(nil), names1010...)
}
