package draw

import (
	"errors"
	"strconv"
	"strings"
)

// StratumSpec stratifies on one column. A categorical column is used as it
// is (one stratum per value); a numeric column needs either Bins (quantile
// bins) or Edges (explicit, strictly increasing edges). Several specs form
// the cross product of their levels.
type StratumSpec struct {
	Column string
	Bins   int
	Edges  []float64
}

// ParseStrata parses a comma-separated list of specs:
//
//	region              categorical column
//	score:q5            numeric column in 5 quantile bins
//	score:edges=0,1,2.5 numeric column cut at explicit edges
//
// so "score:q5,region" crosses score quintiles with region. Numbers after
// an edges= field continue its edge list; a column name therefore cannot be
// a bare number.
func ParseStrata(s string) ([]StratumSpec, error) {
	var specs []StratumSpec
	inEdges := false
	pos := 0
	for _, tok := range strings.Split(s, ",") {
		at := pos
		pos += len(tok) + 1
		tok = strings.TrimSpace(tok)
		if inEdges {
			if v, err := strconv.ParseFloat(tok, 64); err == nil {
				last := &specs[len(specs)-1]
				last.Edges = append(last.Edges, v)
				continue
			}
			inEdges = false
		}
		if tok == "" {
			return nil, &parseError{Pos: at, Field: tok, Err: errors.New("empty field")}
		}
		col, opt, hasOpt := strings.Cut(tok, ":")
		col = strings.TrimSpace(col)
		if col == "" {
			return nil, &parseError{Pos: at, Field: tok, Err: errors.New("missing column name")}
		}
		sp := StratumSpec{Column: col}
		if hasOpt {
			opt = strings.TrimSpace(opt)
			switch {
			case strings.HasPrefix(opt, "q"):
				k, err := strconv.Atoi(opt[1:])
				if err != nil || k < 1 {
					return nil, &parseError{Pos: at, Field: tok, Err: errors.New("want qN with N ≥ 1 quantile bins")}
				}
				sp.Bins = k
			case strings.HasPrefix(opt, "edges="):
				v, err := strconv.ParseFloat(strings.TrimSpace(opt[len("edges="):]), 64)
				if err != nil {
					return nil, &parseError{Pos: at, Field: tok, Err: err}
				}
				sp.Edges = []float64{v}
				inEdges = true
			default:
				return nil, &parseError{Pos: at, Field: tok, Err: errors.New("want qN or edges=a,b,…")}
			}
		}
		specs = append(specs, sp)
	}
	return specs, nil
}

// FormatStrata formats specs in the form ParseStrata reads.
func FormatStrata(specs []StratumSpec) string {
	var b strings.Builder
	for i, sp := range specs {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(sp.Column)
		switch {
		case sp.Bins > 0:
			b.WriteString(":q" + strconv.Itoa(sp.Bins))
		case len(sp.Edges) > 0:
			b.WriteString(":edges=")
			for j, e := range sp.Edges {
				if j > 0 {
					b.WriteByte(',')
				}
				b.WriteString(fmtNum(e))
			}
		}
	}
	return b.String()
}

func fmtNum(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
