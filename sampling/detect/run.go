package detect

import (
	"context"
	"errors"
	"fmt"
	"hash/fnv"
	"os"
	"path/filepath"
	"strconv"
	"sync"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// Result summarises a Run.
type Result struct {
	Processed int                 // recordings detected in this run
	Skipped   int                 // recordings whose output already existed (resumed)
	Redone    int                 // recordings detected again: their settings had changed
	Failed    int                 // recordings that could not be processed
	Events    int                 // candidate rows written in this run
	Warnings  map[string][]string // per RecordingID: degradations and failures
}

// ShardOf returns the shard (of n) that a recording belongs to: the FNV-1a
// hash of its id modulo n, so the split is the same on every machine and run.
func ShardOf(recordingID string, n int) int {
	if n <= 1 {
		return 0
	}
	h := fnv.New64a()
	h.Write([]byte(recordingID))
	return int(h.Sum64() % uint64(n))
}

// OutputPath is where Run writes a recording's candidates:
// OutDir/shard=i/<recording_id>.parquet.
func OutputPath(outDir string, shard int, recordingID string) string {
	return filepath.Join(outDir, "shard="+strconv.Itoa(shard), recordingID+".parquet")
}

// Run detects candidates in every recording of the selected shard, in
// parallel over o.Workers recordings, and writes one Parquet file per
// recording (candidate.Write, atomic). A recording whose file exists and was
// detected with the same settings is skipped, so an interrupted run resumes
// where it stopped; one detected with other settings is detected again. A recording that
// fails is counted and its error kept in Result.Warnings; the run goes on.
// The error return is for invalid options, a cancelled context, or an
// output folder that cannot be created.
func Run(ctx context.Context, o Options) (*Result, error) {
	s, err := o.settings()
	if err != nil {
		return nil, err
	}
	if o.OutDir == "" {
		return nil, &OptionError{"OutDir", "", "required"}
	}
	shard := 0
	if s.shards > 1 {
		shard = s.shard
	}
	dir := filepath.Join(o.OutDir, "shard="+strconv.Itoa(shard))
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	fp := s.fingerprint()
	var todo []archive.Recording
	res := &Result{Warnings: map[string][]string{}}
	for _, r := range o.Recordings {
		if ShardOf(r.RecordingID, s.shards) != shard {
			continue
		}
		ok, exists := current(o.OutDir, shard, r.RecordingID, fp)
		if ok {
			res.Skipped++
			continue
		}
		if exists {
			res.Redone++
		}
		todo = append(todo, r)
	}
	bar := func(int) {}
	if o.Progress != nil {
		b := o.Progress(len(todo), "detect")
		defer b.Finish()
		bar = b.Add
	}
	var mu sync.Mutex
	jobs := make(chan archive.Recording)
	var wg sync.WaitGroup
	for range min(s.workers, max(len(todo), 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for r := range jobs {
				n, warns, err := runOne(ctx, s, o.Roots, o.OutDir, shard, r)
				mu.Lock()
				if err != nil {
					res.Failed++
					warns = append(warns, err.Error())
				} else {
					res.Processed++
					res.Events += n
				}
				if len(warns) > 0 {
					res.Warnings[r.RecordingID] = warns
				}
				bar(1)
				mu.Unlock()
			}
		}()
	}
	for _, r := range todo {
		if ctx.Err() != nil {
			break
		}
		jobs <- r
	}
	close(jobs)
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return res, err
	}
	return res, nil
}

// runOne detects in one recording and writes its table.
func runOne(ctx context.Context, s *settings, roots []string, outDir string, shard int, r archive.Recording) (int, []string, error) {
	fail := func(stage string, err error) (int, []string, error) {
		return 0, nil, &RecordingError{RecordingID: r.RecordingID, Path: r.Path, Stage: stage, Err: err}
	}
	if int(r.Root) < 0 || int(r.Root) >= len(roots) {
		return fail("open", fmt.Errorf("root index %d outside %d roots", r.Root, len(roots)))
	}
	f, err := edf.Open(filepath.Join(roots[r.Root], r.Path))
	if err != nil {
		return fail("open", err)
	}
	defer f.Close()
	// rows are written as each window is measured, so memory does not grow
	// with the recording; the table appears only when complete
	out, err := candidate.NewWriter(OutputPath(outDir, shard, r.RecordingID))
	if err != nil {
		return fail("write", err)
	}
	defer out.Abort()
	var werr error
	warns, err := detectFile(ctx, s, f, r.RecordingID, r.SubjectKey, func(rows []candidate.Row) error {
		werr = out.Write(rows)
		return werr
	})
	switch {
	case werr != nil:
		_, _, e := fail("write", werr)
		return 0, warns, e
	case err != nil:
		if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
			return 0, warns, err
		}
		_, _, e := fail("read", err)
		return 0, warns, e
	}
	if err := out.Close(); err != nil {
		_, _, e := fail("write", err)
		return 0, warns, e
	}
	if err := writeFingerprint(outDir, shard, r.RecordingID, s.fingerprint()); err != nil {
		_, _, e := fail("write", err)
		return 0, warns, e
	}
	return int(out.Rows()), warns, nil
}
