package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

var (
	demoOnce sync.Once
	demoDir  string
	demoErr  error
	demoLog  bytes.Buffer // the demo's stderr
)

// demoStudy returns a fresh copy of one small demo study (made once per test binary),
// so that each test may damage its own.
func demoStudy(t *testing.T) string {
	t.Helper()
	if testing.Short() {
		t.Skip("needs a demo study; skipped in -short mode")
	}
	demoOnce.Do(func() {
		dir, err := os.MkdirTemp("", "quorate-store-demo-")
		if err != nil {
			demoErr = err
			return
		}
		demoDir = filepath.Join(dir, "demo")
		var buf bytes.Buffer
		root := newRoot(&globals{argv: []string{"quorate", "demo"}, stdout: &buf, stderr: &demoLog})
		root.SetArgs([]string{"--quiet", "--workers", "2", "demo", "--out", demoDir, "--recordings", "3", "--minutes", "3",
			"--n", "60", "--raters", "3", "--seed", "5"})
		demoErr = root.Execute()
	})
	if demoErr != nil {
		t.Fatal("demo:", demoErr)
	}
	dst := filepath.Join(t.TempDir(), "demo")
	if out, err := exec.Command("cp", "-a", demoDir, dst).CombinedOutput(); err != nil {
		t.Fatalf("copy demo: %v %s", err, out)
	}
	// The copy's study.yaml names the shared archive, which is only ever read.
	return filepath.Join(dst, "study")
}

// run runs one quorate command line and returns its output and error.
func run(t *testing.T, args ...string) (string, error) {
	t.Helper()
	var buf bytes.Buffer
	g := &globals{argv: append([]string{"quorate"}, args...), stdout: &buf}
	root := newRoot(g)
	root.SetArgs(append([]string{"--quiet"}, args...))
	err := root.Execute()
	return buf.String(), err
}

// draw --top-up -10 once wrote a fresh draw over the old one with no copy and exit 0,
// and tune then tuned on a consensus of events no longer drawn.
func TestDrawTopUpAndStaleTune(t *testing.T) {
	st := demoStudy(t)
	drawPath := filepath.Join(st, study.DrawDir, draw.DrawFile)
	before, _ := os.ReadFile(drawPath)
	for _, n := range []string{"-10", "0"} {
		_, err := run(t, "--study", st, "draw", "--top-up", n)
		var ue usageError
		if !errors.As(err, &ue) || !strings.Contains(err.Error(), "--top-up") {
			t.Errorf("draw --top-up %s: %v, want a usage error naming --top-up", n, err)
		}
	}
	if after, _ := os.ReadFile(drawPath); !bytes.Equal(before, after) {
		t.Fatal("a refused top-up changed the draw")
	}
	if _, err := run(t, "--study", st, "tune"); err != nil {
		t.Fatalf("tune on a study of one generation: %v", err)
	}
	if _, err := run(t, "--study", st, "draw", "--replace", "--n", "40", "--seed", "77"); err != nil {
		t.Fatal(err)
	}
	_, err := run(t, "--study", st, "tune")
	var se *study.StaleError
	if !errors.As(err, &se) || se.Stage != "packets" || !strings.Contains(err.Error(), "quorate packets --replace") {
		t.Fatalf("tune after draw --replace: %v, want a refusal naming packets and quorate packets --replace", err)
	}
	for _, cmd := range [][]string{{"export", "--to", filepath.Join(t.TempDir(), "x")}, {"merge", drawPath}} {
		if _, err := run(t, append([]string{"--study", st}, cmd...)...); !errors.As(err, &se) {
			t.Errorf("%s after draw --replace: %v, want a refusal", cmd[0], err)
		}
	}
	if _, err := run(t, "--study", st, "--force", "tune"); err != nil {
		t.Errorf("tune --force: %v", err)
	}
}

// Two writers at once once left a consensus missing a return; the second waits, then
// refuses with the holder's pid and command.
func TestSecondWriterRefused(t *testing.T) {
	st := demoStudy(t)
	s, err := study.Open(st)
	if err != nil {
		t.Fatal(err)
	}
	old := study.LockWait
	study.LockWait = 200 * time.Millisecond
	defer func() { study.LockWait = old }()
	unlock, err := s.Lock([]string{"quorate", "merge", "held.json"})
	if err != nil {
		t.Fatal(err)
	}
	_, err = run(t, "--study", st, "tune")
	unlock()
	if !errors.Is(err, study.ErrLocked) || !strings.Contains(err.Error(), "quorate merge held.json") {
		t.Fatalf("tune while merge holds the study: %v, want a refusal naming the holder", err)
	}
	if _, err := run(t, "--study", st, "tune"); err != nil {
		t.Errorf("tune after the holder finished: %v", err)
	}
}

// export reported a damaged table as a missing step, and a date-offset file it could
// not read was replaced by new offsets; --to the study --replace moved the study aside.
func TestExportRefusals(t *testing.T) {
	st := demoStudy(t)
	out := filepath.Join(t.TempDir(), "x")
	if _, err := run(t, "--study", st, "export", "--to", st, "--replace"); err == nil || !strings.Contains(err.Error(), "never touches") {
		t.Errorf("export --to the study --replace: %v, want a refusal", err)
	}
	if _, err := os.Stat(filepath.Join(st, study.ConfigFile)); err != nil {
		t.Fatal("the study moved:", err)
	}
	shifts := filepath.Join(st, dateShiftFile)
	os.Remove(shifts)
	if err := os.Mkdir(shifts, 0o700); err != nil { // present but unreadable as a file
		t.Fatal(err)
	}
	if _, err := run(t, "--study", st, "export", "--to", out, "--shift-dates"); err == nil || !strings.Contains(err.Error(), "not made again") {
		t.Errorf("unreadable date offsets: %v, want a refusal", err)
	}
	if fi, err := os.Stat(shifts); err != nil || !fi.IsDir() {
		t.Error("the date offsets were replaced")
	}
	drawPath := filepath.Join(st, study.DrawDir, draw.DrawFile)
	b, _ := os.ReadFile(drawPath)
	os.WriteFile(drawPath, b[:len(b)/2], 0o644)
	_, err := run(t, "--study", st, "--force", "export", "--to", out)
	if err == nil || strings.Contains(err.Error(), "run quorate draw") || !strings.Contains(err.Error(), drawPath) {
		t.Errorf("damaged draw: %v, want the read error naming %s", err, drawPath)
	}
}

// A quorum above the panel once left every event undecided without a word; a return of
// hundreds of megabytes was stored.
func TestMergeRefusesQuorumAndSize(t *testing.T) {
	st := demoStudy(t)
	y := filepath.Join(st, study.ConfigFile)
	b, _ := os.ReadFile(y)
	os.WriteFile(y, bytes.Replace(b, []byte("quorum: 2"), []byte("quorum: 99"), 1), 0o644)
	big := filepath.Join(t.TempDir(), "big.json")
	os.WriteFile(big, []byte("{}"), 0o644)
	if _, err := run(t, "--study", st, "merge", big); err == nil || !strings.Contains(err.Error(), "panel.quorum is 99") {
		t.Errorf("quorum 99: %v", err)
	}
	os.WriteFile(y, b, 0o644)
	if err := os.Truncate(big, maxReturnBytes+1); err != nil {
		t.Fatal(err)
	}
	if _, err := run(t, "--study", st, "merge", big); err == nil || !strings.Contains(err.Error(), "more than the") {
		t.Errorf("oversized return: %v", err)
	}
}

// tune once dropped an agreement.json it could not parse and reported without it; a
// killed run's temporary files are removed by the next writer.
func TestTuneAgreementAndLeftovers(t *testing.T) {
	st := demoStudy(t)
	left := filepath.Join(st, study.TuningDir, ".report.html.tmp-4242")
	os.WriteFile(left, []byte("half"), 0o644)
	agr := filepath.Join(st, study.ConsensusDir, merge.AgreementJSON)
	b, _ := os.ReadFile(agr)
	os.WriteFile(agr, b[:len(b)/2], 0o644)
	if _, err := run(t, "--study", st, "--force", "tune"); err == nil || !strings.Contains(err.Error(), agr) {
		t.Errorf("tune with a damaged agreement.json: %v, want an error naming it", err)
	}
	if _, err := os.Stat(left); err == nil {
		t.Error("leftover temporary file kept")
	}
}

func TestMain(m *testing.M) {
	code := m.Run()
	if demoDir != "" {
		os.RemoveAll(filepath.Dir(demoDir))
	}
	if binPath != "" {
		os.RemoveAll(filepath.Dir(binPath))
	}
	os.Exit(code)
}

// The same file merged twice at once once got two ledger entries; under the lock the
// second merge waits and finds it stored.
func TestConcurrentMergeOneEntry(t *testing.T) {
	st := demoStudy(t)
	inbox, _ := filepath.Glob(filepath.Join(filepath.Dir(st), "inbox", "*.json"))
	if len(inbox) == 0 {
		t.Fatal("demo inbox empty")
	}
	var v any
	b, _ := os.ReadFile(inbox[0])
	if err := json.Unmarshal(b, &v); err != nil {
		t.Fatal(err)
	}
	again, _ := json.MarshalIndent(v, "", "   ") // the same answers, other bytes: a new return
	f := filepath.Join(t.TempDir(), "again.json")
	os.WriteFile(f, again, 0o644)
	ledger := filepath.Join(st, study.ReturnsDir, merge.LedgerFile)
	before, _ := merge.ReadLedger(ledger)
	var wg sync.WaitGroup
	errs := make([]error, 2)
	for i := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			_, errs[i] = run(t, "--study", st, "merge", f)
		}()
	}
	wg.Wait()
	if errs[0] != nil || errs[1] != nil {
		t.Fatalf("merges: %v, %v", errs[0], errs[1])
	}
	after, _ := merge.ReadLedger(ledger)
	if len(after) != len(before)+1 {
		t.Errorf("ledger grew by %d entries, want 1", len(after)-len(before))
	}
}

// check finds a whole study whole, and names each kind of damage a QA lead must see
// before a report goes out.
func TestCheck(t *testing.T) {
	st := demoStudy(t)
	// A refused file is logged in returns/refused.jsonl, beside the stored returns: a
	// log, not a stored return (check once called it changed and not in the ledger).
	junk := filepath.Join(t.TempDir(), "junk.json")
	os.WriteFile(junk, []byte(`{"format": "something else"}`), 0o644)
	if _, err := run(t, "--study", st, "merge", junk); err == nil {
		t.Fatal("merge accepted a file that is no return")
	}
	if out, err := run(t, "--study", st, "check"); err != nil || !strings.Contains(out, "whole and of one generation") {
		t.Fatalf("check of the demo study with a refused file: %v\n%s", err, out)
	}
	refused := filepath.Join(st, study.ReturnsDir, merge.RefusedFile)
	if f, err := os.OpenFile(refused, os.O_APPEND|os.O_WRONLY, 0); err != nil {
		t.Fatal(err)
	} else {
		f.WriteString(`{"time": "torn`)
		f.Close()
	}
	stored, _ := filepath.Glob(filepath.Join(st, study.ReturnsDir, "*.json"))
	os.Chmod(stored[0], 0o644)
	b, _ := os.ReadFile(stored[0])
	os.WriteFile(stored[0], bytes.Replace(b, []byte(`"present"`), []byte(`"absent"`), 1), 0o444)
	cons := filepath.Join(st, study.ConsensusDir, merge.ConsensusFile)
	c, _ := os.ReadFile(cons)
	os.WriteFile(cons, c[:len(c)-20], 0o644)
	os.Chmod(filepath.Join(st, study.SecretFile), 0o644)
	if _, err := run(t, "--study", st, "--force", "draw", "--replace", "--n", "40", "--seed", "9"); err != nil {
		t.Fatal(err)
	}
	// What a kill -9 leaves: a writer's temporary file, and a folder moved aside
	// just before its replacement was renamed into place.
	os.WriteFile(filepath.Join(st, study.ConsensusDir, ".consensus.parquet.tmp-4242"), c[:10], 0o644)
	os.Rename(filepath.Join(st, study.TuningDir), filepath.Join(st, ".tuning.aside.tmp-77"))
	out, err := run(t, "--study", st, "check")
	if err == nil {
		t.Error("check passed a damaged study")
	}
	for _, want := range []string{
		"damaged  returns/" + filepath.Base(stored[0]) + ": its content's SHA-256",
		"damaged  returns/" + merge.RefusedFile + ": ",
		"damaged  consensus/consensus.parquet: ",
		"exposed  .quorate/secret: mode -rw-r--r--",
		"stale    packets: ",
		"leftover consensus/.consensus.parquet.tmp-4242: temporary file of a command stopped",
		"leftover .tuning.aside.tmp-77: tuning as it was before a command stopped",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q:\n%s", want, out)
		}
	}
}

// Logs go to the injected stderr, like output to stdout: tune's warning about folds
// (3 subjects, 5 folds asked for) is found there.
func TestStderrInjectable(t *testing.T) {
	st := demoStudy(t)
	var out, errs bytes.Buffer
	g := &globals{argv: []string{"quorate", "tune"}, stdout: &out, stderr: &errs}
	root := newRoot(g)
	root.SetArgs([]string{"--quiet", "--study", st, "tune"})
	if err := root.Execute(); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(errs.String(), "folds asked for") || !strings.Contains(out.String(), "Operating point") {
		t.Errorf("stderr %q, stdout %q", errs.String(), out.String())
	}
}

// A damaged Parquet file once made every command panic (exit 2, a usage error); a
// Parquet file of another table was read as zero-valued rows.
func TestDamagedTablesAreErrors(t *testing.T) {
	st := demoStudy(t)
	cons := filepath.Join(st, study.ConsensusDir, merge.ConsensusFile)
	drawPath := filepath.Join(st, study.DrawDir, draw.DrawFile)
	good, _ := os.ReadFile(cons)
	os.WriteFile(cons, good[:len(good)*2/3], 0o644)
	if code := execute([]string{"--quiet", "--force", "--study", st, "tune"}); code != exitError {
		t.Errorf("tune on a torn consensus: exit %d, want %d", code, exitError)
	}
	_, err := run(t, "--study", st, "--force", "tune")
	if err == nil || !strings.Contains(err.Error(), cons) || !strings.Contains(err.Error(), "damaged") {
		t.Errorf("torn consensus: %v", err)
	}
	other, _ := os.ReadFile(drawPath)
	os.WriteFile(cons, other, 0o644)
	_, err = run(t, "--study", st, "--force", "tune")
	if err == nil || !strings.Contains(err.Error(), "another table") {
		t.Errorf("draw.parquet as the consensus: %v, want a schema refusal", err)
	}
}
