package study

import (
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

func newStudy(t *testing.T) *Study {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "s")
	if err := Init(dir, []string{t.TempDir()}, 1); err != nil {
		t.Fatal(err)
	}
	s, err := Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Two writers at once once lost a return; the second must wait and then refuse, naming
// the holder's pid and command. flock(2) locks conflict between two open file
// descriptions even in one process, so one process can show it.
func TestLockRefusesSecondWriter(t *testing.T) {
	s := newStudy(t)
	old := LockWait
	LockWait = 300 * time.Millisecond
	defer func() { LockWait = old }()
	unlock, err := s.Lock([]string{"quorate", "merge", "a.json"})
	if err != nil {
		t.Fatal(err)
	}
	start := time.Now()
	_, err = s.Lock([]string{"quorate", "merge", "b.json"})
	var le *LockedError
	if !errors.As(err, &le) || !errors.Is(err, ErrLocked) {
		t.Fatalf("second writer: %v, want a LockedError", err)
	}
	if waited := time.Since(start); waited < LockWait {
		t.Errorf("gave up after %v, want a wait of %v", waited, LockWait)
	}
	if !strings.Contains(err.Error(), "pid "+strconv.Itoa(os.Getpid())) || !strings.Contains(err.Error(), "quorate merge a.json") {
		t.Errorf("message %q lacks the holder's pid and command", err)
	}
	unlock()
	again, err := s.Lock([]string{"quorate", "tune"})
	if err != nil {
		t.Fatalf("after release: %v", err)
	}
	again()
}

// A stage whose input changed after it ran is stale, named with the command that
// rebuilds it; a stage later in the pipeline is not checked by an earlier command.
func TestGenerations(t *testing.T) {
	s := newStudy(t)
	s.Stages = []Stage{
		{Name: "draw", Inputs: []string{"candidates"}, Refresh: "quorate draw --replace"},
		{Name: "packets", Inputs: []string{"draw/draw.parquet"}, Refresh: "quorate packets --replace"},
		{Name: "tune", Inputs: []string{"draw/draw.parquet"}, Refresh: "quorate tune"},
	}
	write := func(p, content string) {
		if err := os.MkdirAll(filepath.Dir(s.Path(p)), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(s.Path(p), []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("candidates/shard=0/a.parquet", "a")
	write("draw/draw.parquet", "first draw")
	for _, c := range []string{"draw", "packets"} {
		if err := s.Record(Entry{Command: c}); err != nil {
			t.Fatal(err)
		}
	}
	if err := s.CheckFresh("tune"); err != nil {
		t.Fatalf("fresh study: %v", err)
	}
	write("draw/draw.parquet", "replaced draw") // quorate draw --replace
	if err := s.Record(Entry{Command: "draw"}); err != nil {
		t.Fatal(err)
	}
	err := s.CheckFresh("tune")
	var se *StaleError
	if !errors.As(err, &se) || se.Stage != "packets" || se.Input != "draw/draw.parquet" || !strings.Contains(err.Error(), "quorate packets --replace") {
		t.Fatalf("tune after a replaced draw: %v, want packets stale", err)
	}
	if err := s.CheckFresh("packets"); err != nil {
		t.Errorf("packets checks only the stages before it: %v", err)
	}
	// A new candidate file (detect redone) makes the draw stale too.
	write("candidates/shard=0/b.parquet", "b")
	if st, _ := s.Stale(""); len(st) != 2 || st[0].Stage != "draw" {
		t.Errorf("stale %v, want draw and packets", st)
	}
	// A run that rebuilt nothing keeps its generation.
	if err := s.Record(Entry{Command: "packets", KeepGeneration: true}); err != nil {
		t.Fatal(err)
	}
	if st, _ := s.Stale(""); len(st) != 2 {
		t.Errorf("a run that rebuilt nothing refreshed its generation: %v", st)
	}
}

// study.Hash once skipped a file it could not read; it is listed with the error.
func TestHashNamesUnreadable(t *testing.T) {
	s := newStudy(t)
	p := s.Path("consensus", "x.parquet")
	os.MkdirAll(filepath.Dir(p), 0o755)
	// A link to nothing cannot be opened, even by root.
	if err := os.Symlink(filepath.Join(t.TempDir(), "gone"), p); err != nil {
		t.Fatal(err)
	}
	hs := s.Hash(s.Path("consensus"))
	if len(hs) != 1 || hs[0].Error == "" || hs[0].SHA256 != "" {
		t.Fatalf("hashes %+v, want the unreadable file with its error", hs)
	}
	if _, err := s.HashAll(s.Path("consensus")); err == nil {
		t.Error("HashAll passed an unreadable file")
	}
	if hs := s.Hash(s.Path("absent")); len(hs) != 0 {
		t.Errorf("absent path gave %+v", hs)
	}
}

// An empty study.yaml once said only "EOF"; counts below zero and a quorum above the
// panel were clamped without a word.
func TestConfigRefusals(t *testing.T) {
	s := newStudy(t)
	p := s.Path(ConfigFile)
	good, _ := os.ReadFile(p)
	os.WriteFile(p, nil, 0o644)
	if _, err := ReadConfig(p); err == nil || !strings.Contains(err.Error(), "is empty") {
		t.Errorf("empty study.yaml: %v", err)
	}
	for _, c := range []struct{ from, to, field string }{
		{"controls: 30", "controls: -5", "draw.controls"},
		{"folds: 5", "folds: -3", "tuning.folds"},
		{"folds: 5", "folds: 1", "tuning.folds"},
		{"raters: []", "raters: [a, b, c]\n  quorum: 99", "panel.quorum"},
		{"quorum: 2", "quorum: -1", "panel.quorum"},
	} {
		y := strings.Replace(string(good), c.from, c.to, 1)
		if y == string(good) {
			t.Fatalf("template lacks %q", c.from)
		}
		if c.field == "panel.quorum" && strings.Contains(c.to, "99") {
			y = strings.Replace(y, "\n  quorum: 2", "", 1)
		}
		os.WriteFile(p, []byte(y), 0o644)
		_, err := ReadConfig(p)
		var ce *ConfigError
		if !errors.As(err, &ce) || ce.Field != c.field {
			t.Errorf("%s: %v, want a ConfigError on %s", c.to, err, c.field)
		}
	}
}

// The exclusive-file lock, used where flock(2) is not available, refuses a second
// holder and names the first.
func TestExclusiveLock(t *testing.T) {
	p := filepath.Join(t.TempDir(), "lock")
	unlock, _, err := tryExclusive(p, "pid 1: quorate merge a.json")
	if err != nil || unlock == nil {
		t.Fatal(err)
	}
	if u, held, err := tryExclusive(p, "pid 2"); u != nil || err != nil || !strings.Contains(held, "quorate merge a.json") {
		t.Errorf("second holder: %v %q %v", u != nil, held, err)
	}
	unlock()
	if u, _, err := tryExclusive(p, "pid 2"); u == nil || err != nil {
		t.Errorf("after release: %v", err)
	} else {
		u()
	}
}

// An output edited after its stage wrote it (a consensus changed by hand) is stale too,
// named with the command that rebuilds it.
func TestGenerationsOutputChanged(t *testing.T) {
	s := newStudy(t)
	s.Stages = []Stage{
		{Name: "merge", Inputs: []string{"packets/key.parquet"}, Outputs: []string{"consensus/consensus.parquet"}, Refresh: "quorate merge"},
		{Name: "tune", Refresh: "quorate tune"},
	}
	for p, c := range map[string]string{"packets/key.parquet": "key", "consensus/consensus.parquet": "built"} {
		os.MkdirAll(filepath.Dir(s.Path(p)), 0o755)
		os.WriteFile(s.Path(p), []byte(c), 0o644)
	}
	if err := s.Record(Entry{Command: "merge"}); err != nil {
		t.Fatal(err)
	}
	if err := s.CheckFresh("tune"); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(s.Path("consensus/consensus.parquet"), []byte("edited"), 0o644)
	err := s.CheckFresh("tune")
	var se *StaleError
	if !errors.As(err, &se) || !se.Output || !strings.Contains(err.Error(), "consensus/consensus.parquet changed after merge wrote it") {
		t.Errorf("edited consensus: %v", err)
	}
}
