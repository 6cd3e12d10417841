package signal

// The kernels run one, two or four sections in the same loop, so that the
// later sections' recurrences overlap the first's in the processor pipeline;
// one section alone is bound by the latency of its feedback chain.
// Coefficients are read through the pointer on every sample rather than
// held in locals: the loads are off the critical path, and this leaves the
// registers for the states, which are on it.

func oneUp(s *[6]float64, z *[2]float64, x []float64) {
	z1, z2 := z[0], z[1]
	for i, v := range x {
		y := s[0]*v + z1
		z1 = s[1]*v - s[4]*y + z2
		z2 = s[2]*v - s[5]*y
		x[i] = y
	}
	z[0], z[1] = z1, z2
}

func oneDown(s *[6]float64, z *[2]float64, x []float64) {
	z1, z2 := z[0], z[1]
	for i := len(x) - 1; i >= 0; i-- {
		v := x[i]
		y := s[0]*v + z1
		z1 = s[1]*v - s[4]*y + z2
		z2 = s[2]*v - s[5]*y
		x[i] = y
	}
	z[0], z[1] = z1, z2
}

func pairUp(s *[2][6]float64, z *[2][2]float64, x []float64) {
	p, q := &s[0], &s[1]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	for i, v := range x {
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		x[i] = u
	}
	z[0], z[1] = [2]float64{p1, p2}, [2]float64{q1, q2}
}

func pairDown(s *[2][6]float64, z *[2][2]float64, x []float64) {
	p, q := &s[0], &s[1]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	for i := len(x) - 1; i >= 0; i-- {
		v := x[i]
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		x[i] = u
	}
	z[0], z[1] = [2]float64{p1, p2}, [2]float64{q1, q2}
}

func quadUp(s *[4][6]float64, z *[4][2]float64, x []float64) {
	p, q, r, t := &s[0], &s[1], &s[2], &s[3]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	r1, r2, t1, t2 := z[2][0], z[2][1], z[3][0], z[3][1]
	for i, v := range x {
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		w := r[0]*u + r1
		r1 = r[1]*u - r[4]*w + r2
		r2 = r[2]*u - r[5]*w
		o := t[0]*w + t1
		t1 = t[1]*w - t[4]*o + t2
		t2 = t[2]*w - t[5]*o
		x[i] = o
	}
	z[0], z[1] = [2]float64{p1, p2}, [2]float64{q1, q2}
	z[2], z[3] = [2]float64{r1, r2}, [2]float64{t1, t2}
}

func quadDown(s *[4][6]float64, z *[4][2]float64, x []float64) {
	p, q, r, t := &s[0], &s[1], &s[2], &s[3]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	r1, r2, t1, t2 := z[2][0], z[2][1], z[3][0], z[3][1]
	for i := len(x) - 1; i >= 0; i-- {
		v := x[i]
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		w := r[0]*u + r1
		r1 = r[1]*u - r[4]*w + r2
		r2 = r[2]*u - r[5]*w
		o := t[0]*w + t1
		t1 = t[1]*w - t[4]*o + t2
		t2 = t[2]*w - t[5]*o
		x[i] = o
	}
	z[0], z[1] = [2]float64{p1, p2}, [2]float64{q1, q2}
	z[2], z[3] = [2]float64{r1, r2}, [2]float64{t1, t2}
}

// tripleUp and tripleDown run three cascaded sections in one loop, as
// quadUp does four: each section's update for sample i overlaps the next
// section's for sample i−1 in the processor, where running the third
// section alone (oneUp) waits on its own recursion every sample.
func tripleUp(s *[3][6]float64, z *[3][2]float64, x []float64) {
	p, q, r := &s[0], &s[1], &s[2]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	r1, r2 := z[2][0], z[2][1]
	for i, v := range x {
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		w := r[0]*u + r1
		r1 = r[1]*u - r[4]*w + r2
		r2 = r[2]*u - r[5]*w
		x[i] = w
	}
	z[0], z[1], z[2] = [2]float64{p1, p2}, [2]float64{q1, q2}, [2]float64{r1, r2}
}

func tripleDown(s *[3][6]float64, z *[3][2]float64, x []float64) {
	p, q, r := &s[0], &s[1], &s[2]
	p1, p2, q1, q2 := z[0][0], z[0][1], z[1][0], z[1][1]
	r1, r2 := z[2][0], z[2][1]
	for i := len(x) - 1; i >= 0; i-- {
		v := x[i]
		y := p[0]*v + p1
		p1 = p[1]*v - p[4]*y + p2
		p2 = p[2]*v - p[5]*y
		u := q[0]*y + q1
		q1 = q[1]*y - q[4]*u + q2
		q2 = q[2]*y - q[5]*u
		w := r[0]*u + r1
		r1 = r[1]*u - r[4]*w + r2
		r2 = r[2]*u - r[5]*w
		x[i] = w
	}
	z[0], z[1], z[2] = [2]float64{p1, p2}, [2]float64{q1, q2}, [2]float64{r1, r2}
}
