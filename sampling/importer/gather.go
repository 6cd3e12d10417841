package importer

import (
	"context"
	"os"
	"regexp"
)

// gather reads every input into events, adding rejections and pattern skips to res.
func gather(ctx context.Context, o *Options, rs *resolver, pattern *regexp.Regexp, res *Result) ([]event, error) {
	single := -1
	if o.Recording != "" {
		i, want := rs.find(o.Recording)
		if want != "" {
			return nil, &optionError{Field: "Recording", Value: o.Recording, Want: want}
		}
		single = i
	}
	var all []event
	if o.Kind == KindEDFAnnotations {
		recs := make([]int, 0, len(o.Recordings))
		if len(o.Files) == 0 {
			for i := range o.Recordings {
				recs = append(recs, i)
			}
		}
		for _, key := range o.Files {
			i, want := rs.find(key)
			if want != "" {
				return nil, &optionError{Field: "Files", Value: key, Want: want}
			}
			recs = append(recs, i)
		}
		for _, i := range recs {
			evs, n, err := readAnnotations(ctx, o.Roots, o.Recordings, i, pattern)
			if err != nil {
				return nil, err
			}
			res.Skipped += n
			all = append(all, evs...)
		}
		return all, nil
	}
	for _, file := range o.Files {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		f, err := os.Open(file)
		if err != nil {
			return nil, err
		}
		var evs []event
		var rej []Rejection
		switch o.Kind {
		case KindBIDS:
			fixed, key, why := single, "", ""
			if fixed < 0 {
				fixed, key, why = bidsRecording(file, o.BIDSRecordings, rs)
			}
			var n int
			evs, rej, n, err = readBIDS(f, file, o.Mapping, pattern, fixed, key, why)
			res.Skipped += n
		case KindTSV:
			evs, rej, err = readCSV(f, file, '\t', o.Mapping, single)
		default:
			evs, rej, err = readCSV(f, file, o.Delimiter, o.Mapping, single)
		}
		f.Close()
		if err != nil {
			return nil, err
		}
		res.Rejected = append(res.Rejected, rej...)
		all = append(all, evs...)
	}
	return all, nil
}

// bidsRecording finds the recording of a BIDS events file from the user's mapping, else
// from the file names: the recording index, or a key to resolve per row, or why neither
// is known (rows with a recording column can still name theirs).
func bidsRecording(file string, m map[string]string, rs *resolver) (int, string, string) {
	if len(m) > 0 {
		key, why := mapBIDS(file, m)
		if why != "" {
			return -1, "", why
		}
		if key != "" {
			if i, want := rs.find(key); want == "" {
				return i, "", ""
			}
			return -1, key, ""
		}
	}
	i, why := rs.findBIDS(file)
	return i, "", why
}
