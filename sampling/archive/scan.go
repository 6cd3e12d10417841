package archive

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// Options configure one scan.
type Options struct {
	Roots    []string // archive folders, searched recursively
	Secret   []byte   // the study secret, keys subject keys
	IndexDir string   // where recordings.parquet and problems.csv go
	// PathsFile, when set, receives the recordings' archive paths (WritePaths) and
	// recordings.parquet keeps none; when empty the index keeps them.
	PathsFile string
	Workers   int
	// Progress makes a bar for total files; nil shows none.
	Progress func(total int, desc string) progress.Bar

	fsys func(root string) fs.FS // tests inject unreadable folders
}

// Result summarises a scan.
type Result struct {
	Recordings []Recording
	Problems   []Problem
	Reused     int // rows carried over unchanged from the previous index
	Warnings   int // recordings indexed with warnings, plus problems
}

// found is a file met while walking, before it is read.
type found struct {
	root int
	rel  string
	abs  string
	size int64
	mod  int64
	ext  bool // has an EDF-family file name ending
}

// ErrNoRoots is returned when Options.Roots is empty.
var ErrNoRoots = errors.New("no archive roots to scan")

// Run scans the archive roots and writes the index. One bad file never stops a scan: it
// becomes a row of problems.csv. Files unchanged since the previous scan (same path, size
// and modification time) are not read again.
func Run(ctx context.Context, o Options) (*Result, error) {
	if len(o.Roots) == 0 {
		return nil, ErrNoRoots
	}
	// A root that is not there (an unmounted share) would index as empty and wipe the
	// index: refuse and leave the index as it was.
	for _, r := range o.Roots {
		st, err := os.Stat(r)
		if err != nil {
			return nil, &RootError{Root: r, Err: err}
		}
		if !st.IsDir() {
			return nil, &RootError{Root: r, Err: errors.New("not a folder")}
		}
	}
	if o.Workers < 1 {
		o.Workers = 1
	}
	var problems []Problem
	var files []found
	for i, root := range o.Roots {
		fsys := o.fsys
		if fsys == nil {
			fsys = func(r string) fs.FS { return os.DirFS(r) }
		}
		fl, ps := walk(i, root, fsys(root))
		files = append(files, fl...)
		problems = append(problems, ps...)
	}
	prev := map[string]Recording{}
	if old, err := ReadIndex(filepath.Join(o.IndexDir, IndexFile)); err == nil {
		if o.PathsFile != "" {
			if old, err = AttachPaths(old, o.PathsFile); err != nil {
				old = nil // read every file again
			}
		}
		for _, r := range old {
			prev[key(int(r.Root), r.Path)] = r
		}
	}
	bar := progress.Bar(progress.Silent{})
	if o.Progress != nil {
		bar = o.Progress(len(files), "scanning")
	}
	type outcome struct {
		rec    *Recording
		prob   *Problem
		reused bool
	}
	outs := make([]outcome, len(files))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < o.Workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				f := files[i]
				if r, ok := prev[key(f.root, f.rel)]; ok && r.SizeBytes == f.size && r.ModifiedUnixNano == f.mod {
					outs[i] = outcome{rec: &r, reused: true}
				} else {
					rec, prob := index(f, o.Secret)
					outs[i] = outcome{rec: rec, prob: prob}
				}
				bar.Add(1)
			}
		}()
	}
	for i := range files {
		if ctx.Err() != nil {
			break
		}
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	bar.Finish()
	if err := ctx.Err(); err != nil {
		return nil, err
	}

	res := &Result{}
	first := map[string]string{}
	for i, out := range outs {
		switch {
		case out.prob != nil:
			problems = append(problems, *out.prob)
		case out.rec != nil:
			f := files[i]
			where := displayPath(o.Roots, f.root, f.rel)
			if d, dup := first[out.rec.RecordingID]; dup {
				problems = append(problems, Problem{File: where, Offset: -1,
					Reason: "duplicate: same content as " + d + " (indexed once, under that path)"})
				continue
			}
			first[out.rec.RecordingID] = where
			if out.reused {
				res.Reused++
			}
			if len(out.rec.Warnings) > 0 {
				res.Warnings++
			}
			res.Recordings = append(res.Recordings, *out.rec)
		}
	}
	sort.Slice(problems, func(i, j int) bool { return problems[i].File < problems[j].File })
	res.Problems = problems
	res.Warnings += len(problems)
	stored := res.Recordings
	if o.PathsFile != "" {
		if err := WritePaths(o.PathsFile, res.Recordings); err != nil {
			return nil, err
		}
		stored = withoutPaths(res.Recordings)
	}
	if err := WriteIndex(filepath.Join(o.IndexDir, IndexFile), stored); err != nil {
		return nil, err
	}
	if err := WriteProblems(filepath.Join(o.IndexDir, ProblemsFile), problems); err != nil {
		return nil, err
	}
	return res, nil
}

// RootError reports an archive root that cannot be scanned.
type RootError struct {
	Root string
	Err  error
}

func (e *RootError) Error() string {
	return fmt.Sprintf("archive root %s: %v; nothing was scanned and the index is left as it was", e.Root, e.Err)
}

func (e *RootError) Unwrap() error { return e.Err }

func key(root int, rel string) string { return fmt.Sprintf("%d\x00%s", root, rel) }

func displayPath(roots []string, root int, rel string) string {
	return filepath.ToSlash(filepath.Join(roots[root], rel))
}

// walk lists the files under root in lexical order. Unreadable folders become problems.
// fsys is the root as a file system (os.DirFS in use; tests inject failures).
func walk(ri int, root string, fsys fs.FS) ([]found, []Problem) {
	var files []found
	var probs []Problem
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		abs := filepath.Join(root, filepath.FromSlash(p))
		if err != nil {
			probs = append(probs, Problem{File: filepath.ToSlash(abs), Offset: -1, Reason: "cannot read: " + errReason(err)})
			if d != nil && d.IsDir() && p != "." {
				return fs.SkipDir
			}
			return nil
		}
		if d.IsDir() && p != "." && strings.HasPrefix(d.Name(), ".") {
			return fs.SkipDir // hidden folders, e.g. a study kept inside the archive
		}
		var info fs.FileInfo
		switch {
		case d.Type()&fs.ModeSymlink != 0:
			// A linked recording is followed, a linked folder is not (a loop would
			// never end); neither is passed over without a word.
			info, err = fs.Stat(fsys, p)
			switch {
			case err != nil:
				probs = append(probs, Problem{File: filepath.ToSlash(abs), Offset: -1, Reason: "symbolic link that cannot be followed: " + errReason(err)})
				return nil
			case info.IsDir():
				probs = append(probs, Problem{File: filepath.ToSlash(abs), Offset: -1, Reason: "symbolic link to a folder, not followed: add the folder as an archive root instead"})
				return nil
			case !info.Mode().IsRegular():
				return nil
			}
		case !d.Type().IsRegular():
			return nil
		default:
			info, err = d.Info()
		}
		if err != nil {
			probs = append(probs, Problem{File: filepath.ToSlash(abs), Offset: -1, Reason: "cannot stat: " + errReason(err)})
			return nil
		}
		ext := strings.ToLower(path.Ext(p))
		files = append(files, found{root: ri, rel: p, abs: abs, size: info.Size(),
			mod: info.ModTime().UnixNano(), ext: ext == ".edf" || ext == ".bdf" || ext == ".rec"})
		return nil
	})
	if err != nil {
		probs = append(probs, Problem{File: filepath.ToSlash(root), Offset: -1, Reason: errReason(err)})
	}
	return files, probs
}

func errReason(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

var (
	edfMagic = []byte("0       ")
	bdfMagic = []byte("\xffBIOSEMI")
)

// index reads one file. Files that are not of the EDF family by content and do not carry
// an EDF-family name are passed over silently: archives hold reports and videos too.
func index(f found, secret []byte) (*Recording, *Problem) {
	where := f.abs
	prob := func(field string, off int64, reason string) *Problem {
		return &Problem{File: filepath.ToSlash(where), Field: field, Offset: off, Reason: reason}
	}
	fh, err := os.Open(f.abs)
	if err != nil {
		return nil, prob("", -1, "cannot open: "+errReason(err))
	}
	defer fh.Close()
	var magic [8]byte
	n, _ := io.ReadFull(fh, magic[:])
	if !bytes.Equal(magic[:n], edfMagic) && !bytes.Equal(magic[:n], bdfMagic) {
		if !f.ext {
			return nil, nil
		}
		if f.size == 0 {
			return nil, prob("version", 0, "empty file (0 bytes); want an EDF, EDF+ or BDF recording")
		}
		return nil, prob("version", 0, fmt.Sprintf("got %q, want \"0\" followed by spaces (EDF) or byte 255 and \"BIOSEMI\" (BDF)", magic[:n]))
	}
	sum, err := edf.Inspect(fh, f.size, f.abs)
	if err != nil {
		var fe *edf.FieldError
		if errors.As(err, &fe) {
			return nil, prob(fe.Field, fe.Offset, withheld(fe, err))
		}
		return nil, prob("", -1, err.Error())
	}
	hdr, err := edf.ReadHeader(io.NewSectionReader(fh, 0, f.size), f.abs)
	if err != nil {
		return nil, prob("", -1, err.Error())
	}
	h := sha256.New()
	if _, err := io.Copy(h, io.NewSectionReader(fh, 0, f.size)); err != nil {
		return nil, prob("", -1, "cannot read: "+errReason(err))
	}
	id := hex.EncodeToString(h.Sum(nil))
	rec := &Recording{
		RecordingID:      "rec-" + id[:16],
		SubjectKey:       SubjectKey(secret, hdr.PatientID),
		Root:             int32(f.root),
		Path:             f.rel,
		Format:           sum.Format.String(),
		StartTime:        sum.Start.UTC(),
		DurationS:        sum.Duration,
		RecordCount:      sum.NumRecords,
		RecordDurationS:  sum.RecordDuration,
		EEGChannels:      nonNil(sum.EEG),
		SampleRatesHz:    nonNilF(sum.EEGRates),
		AnnotationCount:  int64(sum.Annotations),
		Discontinuities:  int64(sum.Discontinuities),
		Warnings:         nonNil(sum.Warnings),
		SizeBytes:        f.size,
		ModifiedUnixNano: f.mod,
	}
	if strings.Trim(hdr.PatientID, "X ") == "" {
		rec.Warnings = append(rec.Warnings, "patient identification is empty or anonymised: every such recording shares one subject key")
	}
	return rec, nil
}

// identifying are the EDF header fields that carry a patient's identification (EDF+:
// code, sex, birth date, name; the recording field: admin code, technician, equipment).
var identifying = map[string]bool{"local patient identification": true, "local recording identification": true}

// withheld is the reason a field failed, without the field's content when the field
// identifies the patient: problems.csv must not become a list of names.
func withheld(fe *edf.FieldError, err error) string {
	if !identifying[fe.Field] {
		return err.Error()
	}
	c := *fe
	c.Value = "(content withheld: it identifies the patient)"
	return c.Error()
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

func nonNilF(s []float64) []float64 {
	if s == nil {
		return []float64{}
	}
	return s
}
