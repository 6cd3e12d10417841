package draw

import (
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
)

// Strata is the partition of a frame into strata.
type Strata struct {
	Labels   []string // readable labels, e.g. "score=q3|region=temporal-left", in level order
	Row      []int    // Row[i] is the stratum index of frame row i
	Size     []int    // N_h
	Warnings []Warning
}

// level assigns each row one level of one spec.
type level struct {
	idx    []int32
	labels []string
}

// Stratify partitions f by the cross product of specs. Only combinations
// that hold at least one row become strata; a quantile or interior edge bin
// holding no rows is reported as a warning, not an error. With no specs the
// whole frame is one stratum labelled "all".
func Stratify(f *Frame, specs []StratumSpec) (*Strata, error) {
	n := f.Len()
	var levels []level
	var warns []Warning
	for _, sp := range specs {
		lv, w, err := levelsOf(f, sp)
		if err != nil {
			return nil, err
		}
		levels = append(levels, lv)
		warns = append(warns, w...)
	}
	// code = mixed-radix number with the first spec most significant, so
	// that ascending codes are the lexicographic order of levels.
	code := make([]int64, n)
	for _, lv := range levels {
		radix := int64(len(lv.labels))
		for i := range code {
			code[i] = code[i]*radix + int64(lv.idx[i])
		}
	}
	// Dense counting when the level product is small, a map otherwise.
	prod := int64(1)
	for _, lv := range levels {
		prod *= int64(len(lv.labels))
		if prod > 1<<22 {
			break
		}
	}
	var codes []int64
	var dense []int32
	var sparse map[int64]int
	if prod <= 1<<22 {
		dense = make([]int32, prod)
		for _, c := range code {
			dense[c] = 1
		}
		for c, v := range dense {
			if v != 0 {
				codes = append(codes, int64(c))
			}
		}
	} else {
		sparse = make(map[int64]int)
		for _, c := range code {
			sparse[c] = 0
		}
		for c := range sparse {
			codes = append(codes, c)
		}
		slices.Sort(codes)
	}
	st := &Strata{Row: make([]int, n), Size: make([]int, len(codes)), Warnings: warns}
	for h, c := range codes {
		if dense != nil {
			dense[c] = int32(h)
		} else {
			sparse[c] = h
		}
		st.Labels = append(st.Labels, labelOf(c, levels))
	}
	for i, c := range code {
		var h int
		if dense != nil {
			h = int(dense[c])
		} else {
			h = sparse[c]
		}
		st.Row[i] = h
		st.Size[h]++
	}
	return st, nil
}

func labelOf(c int64, levels []level) string {
	if len(levels) == 0 {
		return "all"
	}
	parts := make([]string, len(levels))
	for j := len(levels) - 1; j >= 0; j-- {
		radix := int64(len(levels[j].labels))
		parts[j] = levels[j].labels[c%radix]
		c /= radix
	}
	return strings.Join(parts, "|")
}

func levelsOf(f *Frame, sp StratumSpec) (level, []Warning, error) {
	if col, ok := f.Cat[sp.Column]; ok {
		if sp.Bins > 0 || len(sp.Edges) > 0 {
			return level{}, nil, &specError{Column: sp.Column, Msg: "categorical column takes no bins or edges"}
		}
		return catLevels(sp.Column, col), nil, nil
	}
	col, ok := f.Num[sp.Column]
	if !ok {
		return level{}, nil, &columnError{Column: sp.Column, Available: f.Columns()}
	}
	switch {
	case sp.Bins > 0 && len(sp.Edges) > 0:
		return level{}, nil, &specError{Column: sp.Column, Msg: "give bins or edges, not both"}
	case sp.Bins > 0:
		lv, w := quantileLevels(sp.Column, col, QuantileEdges(col, sp.Bins))
		return lv, w, nil
	case len(sp.Edges) > 0:
		for i := 1; i < len(sp.Edges); i++ {
			if !(sp.Edges[i] > sp.Edges[i-1]) {
				return level{}, nil, &specError{Column: sp.Column, Msg: "edges must be strictly increasing"}
			}
		}
		lv, w := edgeLevels(sp.Column, col, sp.Edges)
		return lv, w, nil
	}
	return level{}, nil, &specError{Column: sp.Column, Msg: "numeric column needs quantile bins (qN) or edges"}
}

func catLevels(name string, col []string) level {
	seen := make(map[string]int32)
	for _, v := range col {
		seen[v] = 0
	}
	vals := make([]string, 0, len(seen))
	for v := range seen {
		vals = append(vals, v)
	}
	sort.Strings(vals)
	lv := level{idx: make([]int32, len(col))}
	for k, v := range vals {
		seen[v] = int32(k)
		lv.labels = append(lv.labels, name+"="+v)
	}
	for i, v := range col {
		lv.idx[i] = seen[v]
	}
	return lv
}

// QuantileEdges returns the k−1 inner edges of k quantile bins of the
// non-NaN values of x: e_j = x_(⌈jN/k⌉), the inverse of the empirical
// distribution function (Hyndman & Fan 1996, definition 1), so every edge is
// an observed value and no interpolation depends on arithmetic. A value v
// falls in the first bin j with v ≤ e_j (else bin k). Ties are never split:
// all copies of a value share one bin, so heavy ties can leave bins empty.
func QuantileEdges(x []float64, k int) []float64 {
	s := make([]float64, 0, len(x))
	for _, v := range x {
		if !math.IsNaN(v) {
			s = append(s, v)
		}
	}
	if len(s) == 0 || k < 2 {
		return nil
	}
	slices.Sort(s)
	n := len(s)
	e := make([]float64, k-1)
	for j := 1; j < k; j++ {
		r := (j*n + k - 1) / k // ⌈jN/k⌉
		if r < 1 {
			r = 1
		}
		e[j-1] = s[r-1]
	}
	return e
}

func quantileLevels(name string, col, edges []float64) (level, []Warning) {
	k := len(edges) + 1
	lv := level{idx: make([]int32, len(col))}
	count := make([]int, k+1)
	for i, v := range col {
		var b int
		if math.IsNaN(v) {
			b = k
		} else {
			b = sort.SearchFloat64s(edges, v) // first j with v ≤ e_j
		}
		lv.idx[i] = int32(b)
		count[b]++
	}
	for j := 1; j <= k; j++ {
		lv.labels = append(lv.labels, name+"=q"+strconv.Itoa(j))
	}
	lv.labels = append(lv.labels, name+"=NA")
	var w []Warning
	for j := 0; j < k; j++ {
		if count[j] == 0 {
			w = append(w, Warning{Stratum: lv.labels[j], Msg: "quantile bin holds no events (tied values)"})
		}
	}
	return lv, w
}

// edgeLevels cuts at edges e_0<…<e_m into "<e_0", "[e_{j-1},e_j)", ">=e_m"
// and "NA" for NaN.
func edgeLevels(name string, col, edges []float64) (level, []Warning) {
	m := len(edges)
	lv := level{idx: make([]int32, len(col))}
	count := make([]int, m+2)
	for i, v := range col {
		var b int
		if math.IsNaN(v) {
			b = m + 1
		} else {
			b = sort.Search(m, func(j int) bool { return edges[j] > v }) // number of edges ≤ v
		}
		lv.idx[i] = int32(b)
		count[b]++
	}
	lv.labels = append(lv.labels, name+"=<"+fmtNum(edges[0]))
	for j := 1; j < m; j++ {
		lv.labels = append(lv.labels, name+"=["+fmtNum(edges[j-1])+","+fmtNum(edges[j])+")")
	}
	lv.labels = append(lv.labels, name+"=>="+fmtNum(edges[m-1]), name+"=NA")
	var w []Warning
	for j := 1; j < m; j++ {
		if count[j] == 0 {
			w = append(w, Warning{Stratum: lv.labels[j], Msg: "bin holds no events"})
		}
	}
	return lv, w
}
