package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export"
	"github.com/quorate-eeg/quorate/export/report"
)

// The kill test runs the real binary and sends SIGKILL (kill -9) at random moments of
// tune and export, then checks that the study is of one piece. QUORATE_KILLTEST=1
// makes many more tries (about 2 minutes); the default makes a few.

var (
	binOnce sync.Once
	binPath string
	binErr  error
)

// buildQuorate builds this command once per test binary, into a temporary folder
// that TestMain removes with the demo study's.
func buildQuorate(t *testing.T) string {
	t.Helper()
	goBin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go toolchain on PATH to build the binary")
	}
	binOnce.Do(func() {
		dir, err := os.MkdirTemp("", "quorate-kill-bin-")
		if err != nil {
			binErr = err
			return
		}
		binPath = filepath.Join(dir, "quorate")
		if out, err := exec.Command(goBin, "build", "-o", binPath, ".").CombinedOutput(); err != nil {
			binErr = fmt.Errorf("go build: %v\n%s", err, out)
		}
	})
	if binErr != nil {
		t.Fatal(binErr)
	}
	return binPath
}

// runBin runs the binary to the end and returns its exit code and combined output.
func runBin(t *testing.T, bin string, args ...string) (int, string) {
	t.Helper()
	cmd := exec.Command(bin, append([]string{"--quiet"}, args...)...)
	out, err := cmd.CombinedOutput()
	var ee *exec.ExitError
	switch {
	case err == nil:
		return 0, string(out)
	case errors.As(err, &ee):
		return ee.ExitCode(), string(out)
	}
	t.Fatalf("%v: %v", args, err)
	return -1, ""
}

// killAfter starts the binary, sends SIGKILL after d (unless it ended first) and
// reports whether it was killed and, if not, how long it ran. With a non-nil trigger
// the clock starts only when trigger reports true (polled every 200 µs), so that a kill
// can be aimed at the moment a command writes its outputs.
func killAfter(t *testing.T, bin string, trigger func() bool, d time.Duration, args ...string) (bool, time.Duration) {
	t.Helper()
	start := time.Now()
	cmd := exec.Command(bin, append([]string{"--quiet"}, args...)...)
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	ended := func(err error) (bool, time.Duration) {
		if err != nil {
			t.Fatalf("%v ended before the kill with %v:\n%s", args, err, out.String())
		}
		return false, time.Since(start)
	}
	for trigger != nil && !trigger() {
		select {
		case err := <-done:
			return ended(err)
		case <-time.After(200 * time.Microsecond):
		}
	}
	select {
	case err := <-done:
		return ended(err)
	case <-time.After(d):
		cmd.Process.Kill() // SIGKILL on Unix
		<-done
		return true, 0
	}
}

// allIn returns a trigger that is true once a folder matching pattern holds all names.
func allIn(pattern string, names ...string) func() bool {
	return func() bool {
		ds, _ := filepath.Glob(pattern)
		for _, d := range ds {
			n := 0
			for _, name := range names {
				if _, err := os.Lstat(filepath.Join(d, name)); err == nil {
					n++
				}
			}
			if n == len(names) {
				return true
			}
		}
		return false
	}
}

// appears returns a trigger that is true once a file or folder matching pattern exists.
func appears(pattern string) func() bool {
	return func() bool {
		m, _ := filepath.Glob(pattern)
		return len(m) > 0
	}
}

// timed runs the binary to the end and returns how long it took.
func timed(t *testing.T, bin string, args ...string) time.Duration {
	t.Helper()
	start := time.Now()
	if code, out := runBin(t, bin, args...); code != 0 {
		t.Fatalf("%v: exit %d\n%s", args, code, out)
	}
	return time.Since(start)
}

// nextSecond waits for the next whole second, so that a run started now stamps its
// outputs later than any run before it (the report's "generated" has whole seconds).
func nextSecond() {
	now := time.Now()
	time.Sleep(now.Truncate(time.Second).Add(time.Second).Sub(now) + 10*time.Millisecond)
}

// fileHashes returns the SHA-256 of every file directly in dir, by name.
func fileHashes(t *testing.T, dir string) map[string]string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	h := map[string]string{}
	for _, e := range es {
		b, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		s := sha256.Sum256(b)
		h[e.Name()] = hex.EncodeToString(s[:])
	}
	return h
}

// leftovers lists the ".NAME.tmp-N" files and folders under root.
func leftovers(root string) []string {
	var l []string
	filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err == nil && strings.HasPrefix(d.Name(), ".") && strings.Contains(d.Name(), ".tmp-") {
			l = append(l, p)
		}
		return nil
	})
	return l
}

// tuningGeneration checks that tuning/ holds the four report files of one run and
// returns that run's "generated" stamp: the operating point's stamp must be the one
// printed in report.html and report.md.
func tuningGeneration(t *testing.T, st string) (string, map[string]string) {
	t.Helper()
	dir := filepath.Join(st, study.TuningDir)
	h := fileHashes(t, dir)
	names := slices.Sorted(func(yield func(string) bool) {
		for n := range h {
			if !yield(n) {
				return
			}
		}
	})
	want := []string{report.PointFile, report.HTMLFile, report.MarkdownFile, report.SweepFile}
	slices.Sort(want)
	if !slices.Equal(names, want) {
		t.Fatalf("tuning/ holds %v, want %v", names, want)
	}
	b, err := os.ReadFile(filepath.Join(dir, report.PointFile))
	if err != nil {
		t.Fatal(err)
	}
	var op struct {
		Generated string `json:"generated"`
	}
	if err := json.Unmarshal(b, &op); err != nil || op.Generated == "" {
		t.Fatalf("operating point unreadable after kill: %v", err)
	}
	for _, f := range []string{report.HTMLFile, report.MarkdownFile} {
		b, _ := os.ReadFile(filepath.Join(dir, f))
		if !bytes.Contains(b, []byte("generated "+op.Generated)) {
			t.Fatalf("%s is not of the operating point's run (generated %s)", f, op.Generated)
		}
	}
	return op.Generated, h
}

// checkWhole runs quorate check and fails on anything damaged or exposed; stale
// stages are returned (check exits 0 for them). Every .tmp-* leftover the kill left
// must be listed as one (a file inside a leftover folder by that folder).
func checkWhole(t *testing.T, bin, st string) string {
	t.Helper()
	left := leftovers(st)
	code, out := runBin(t, bin, "--study", st, "check")
	if code != 0 || strings.Contains(out, "damaged") || strings.Contains(out, "exposed") {
		t.Fatalf("check after kill: exit %d\n%s", code, out)
	}
	for _, l := range left {
		listed := false
		for p := l; !listed && len(p) > len(st); p = filepath.Dir(p) {
			rel, _ := filepath.Rel(st, p)
			listed = strings.Contains(out, "leftover "+filepath.ToSlash(rel)+": ")
		}
		if !listed {
			t.Fatalf("check after kill does not list the leftover %s:\n%s", l, out)
		}
	}
	return out
}

func killTries() int {
	if os.Getenv("QUORATE_KILLTEST") == "1" {
		return 45
	}
	return 6
}

// kill -9 in tune once left a new operating-point.json beside an old report; the report
// is now written as one folder (atomicfile.WriteDir). After each kill the tuning folder
// is the old run's or the new run's, whole; check finds nothing damaged; the next
// writing command removes the .tmp-* leftovers; tune runs again without --force.
func TestKillTune(t *testing.T) {
	st := demoStudy(t)
	bin := buildQuorate(t)
	full := timed(t, bin, "--study", st, "tune", "--seed", "1")
	oldGen, oldHash := tuningGeneration(t, st)
	rng := rand.New(rand.NewPCG(18, 1))
	killed, kept, unrecorded, between, wasStale := 0, 0, 0, 0, false
	for i := range killTries() {
		nextSecond()
		// Tries in turn: at a random moment of the run; within 100 ms of the
		// moment the new report folder is made (it is renamed into place some
		// 40–70 ms later on a demo study); within 3 ms of the moment all four
		// files are in it, about when the old folder is moved aside.
		d, trigger := time.Duration(rng.Float64()*float64(full)), func() bool { return true }
		switch i % 3 {
		case 1:
			d, trigger = time.Duration(rng.Float64()*float64(100*time.Millisecond)), appears(filepath.Join(st, "."+study.TuningDir+".tmp-*"))
		case 2:
			d, trigger = time.Duration(rng.Float64()*float64(3*time.Millisecond)), allIn(filepath.Join(st, "."+study.TuningDir+".tmp-*"),
				report.PointFile, report.HTMLFile, report.MarkdownFile, report.SweepFile)
		}
		wasKilled, took := killAfter(t, bin, trigger, d, "--study", st, "tune", "--seed", string(rune('2'+i%8)))
		if !wasKilled {
			full = min(full, took) // aim the next kill within the run
		}
		// Killed between WriteDir's two renames: no tuning/ for the moment, the
		// old folder aside; the next writer puts it back.
		if _, err := os.Stat(filepath.Join(st, study.TuningDir)); errors.Is(err, fs.ErrNotExist) {
			between++
			if m, _ := filepath.Glob(filepath.Join(st, "."+study.TuningDir+".aside.tmp-*")); len(m) != 1 {
				t.Fatalf("try %d: no tuning/ and %d folders aside", i, len(m))
			}
			if code, out := runBin(t, bin, "--study", st, "status"); code != 0 {
				t.Fatalf("status after kill: exit %d\n%s", code, out)
			}
		}
		gen, h := tuningGeneration(t, st)
		switch {
		case gen == oldGen:
			kept++
			for n, v := range oldHash {
				if h[n] != v {
					t.Fatalf("try %d (kill after %v): %s changed while the operating point is the old run's", i, d, n)
				}
			}
		case gen < oldGen:
			t.Fatalf("try %d: tuning/ of run %s, older than %s", i, gen, oldGen)
		}
		// A run killed between the report folder's rename and its provenance
		// entry leaves a whole new report that check calls stale ("run quorate
		// tune"); an untouched report keeps the state it had.
		out := checkWhole(t, bin, st)
		isStale := strings.Contains(out, "stale    tune")
		if gen == oldGen && isStale != wasStale {
			t.Fatalf("try %d: the untouched tuning went from stale %v to %v:\n%s", i, wasStale, isStale, out)
		}
		if gen != oldGen && isStale {
			unrecorded++
		}
		wasStale = isStale
		if wasKilled {
			killed++
		}
		oldGen, oldHash = gen, h
		// The next writer removes what the killed one left.
		if code, out := runBin(t, bin, "--study", st, "status"); code != 0 {
			t.Fatalf("status after kill: exit %d\n%s", code, out)
		}
		if l := leftovers(st); len(l) > 0 {
			t.Fatalf("try %d: leftovers after the next command: %v", i, l)
		}
	}
	t.Logf("%d of %d runs killed, %d left the old tuning (%d of them between the two renames), %d a new one not yet in provenance.jsonl",
		killed, killTries(), kept, between, unrecorded)
	if code, out := runBin(t, bin, "--study", st, "tune"); code != 0 {
		t.Fatalf("tune after the kills: exit %d\n%s", code, out)
	}
	if out := checkWhole(t, bin, st); !strings.Contains(out, "whole and of one generation") {
		t.Errorf("check after a last whole tune:\n%s", out)
	}
}

// exportWhole checks that dir is a whole, marked export with exactly the files names.
func exportWhole(t *testing.T, dir string, names []string) {
	t.Helper()
	var got []string
	filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			r, _ := filepath.Rel(dir, p)
			got = append(got, r)
		}
		return nil
	})
	slices.Sort(got)
	if !slices.Equal(got, names) {
		t.Fatalf("%s holds %v, want a whole export %v", dir, got, names)
	}
}

// kill -9 in export once left an unmarked half export at the target. After each kill
// the target is absent or a whole marked export (so are the folders moved aside by
// --replace); the hidden staging folder is removed by the next export.
func TestKillExport(t *testing.T) {
	st := demoStudy(t)
	bin := buildQuorate(t)
	parent := t.TempDir()
	target := filepath.Join(parent, "export")
	full := timed(t, bin, "--study", st, "export", "--to", target)
	var names []string
	filepath.WalkDir(target, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			r, _ := filepath.Rel(target, p)
			names = append(names, r)
		}
		return nil
	})
	slices.Sort(names)
	if !slices.Contains(names, export.MarkerFile) {
		t.Fatalf("a whole export lacks %s: %v", export.MarkerFile, names)
	}
	rng := rand.New(rand.NewPCG(18, 2))
	killed, absent := 0, 0
	for i := range killTries() {
		// Tries in turn: at a random moment of the run; within 100 ms of the
		// moment the staging folder is made; within 3 ms of the moment its
		// marker is written, just before the earlier export is moved aside.
		d, trigger := time.Duration(rng.Float64()*float64(full)), func() bool { return true }
		switch i % 3 {
		case 1:
			d, trigger = time.Duration(rng.Float64()*float64(100*time.Millisecond)), appears(filepath.Join(parent, ".export.tmp-*"))
		case 2:
			d, trigger = time.Duration(rng.Float64()*float64(3*time.Millisecond)), appears(filepath.Join(parent, ".export.tmp-*", export.MarkerFile))
		}
		wasKilled, took := killAfter(t, bin, trigger, d, "--study", st, "export", "--to", target, "--replace")
		if wasKilled {
			killed++
		} else {
			full = min(full, took)
		}
		if _, err := os.Stat(target); err != nil {
			absent++
		}
		es, _ := os.ReadDir(parent)
		for _, e := range es {
			p := filepath.Join(parent, e.Name())
			switch {
			case e.Name() == "export" || strings.HasPrefix(e.Name(), "export.old-"):
				exportWhole(t, p, names)
			case strings.HasPrefix(e.Name(), ".export.tmp-"): // staging of the killed run
			default:
				t.Fatalf("try %d: unexpected %s beside the export", i, e.Name())
			}
		}
		checkWhole(t, bin, st)
		if l := leftovers(st); len(l) > 0 {
			// A killed export may leave an atomic write's temporary file in the
			// study; the next command that takes the lock removes it.
			runBin(t, bin, "--study", st, "status")
			if l := leftovers(st); len(l) > 0 {
				t.Fatalf("try %d: leftovers in the study after the next command: %v", i, l)
			}
		}
	}
	olds, _ := filepath.Glob(target + ".old-*")
	t.Logf("%d of %d exports killed; %d earlier exports moved aside whole, %d times the target absent (killed between the two renames)",
		killed, killTries(), len(olds), absent)
	if code, out := runBin(t, bin, "--study", st, "export", "--to", target, "--replace"); code != 0 {
		t.Fatalf("export after the kills: exit %d\n%s", code, out)
	}
	exportWhole(t, target, names)
	if l := leftovers(parent); len(l) > 0 {
		t.Errorf("staging folders left after a whole export: %v", l)
	}
}
