package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestExitCodes(t *testing.T) {
	if got := execute([]string{"no-such-command"}); got != exitUsage {
		t.Errorf("unknown command: exit %d, want %d", got, exitUsage)
	}
	if got := execute([]string{"version", "--no-such-flag"}); got != exitUsage {
		t.Errorf("unknown flag: exit %d, want %d", got, exitUsage)
	}
	if got := execute([]string{"--log-format", "xml", "version"}); got != exitUsage {
		t.Errorf("bad log format: exit %d, want %d", got, exitUsage)
	}
	if got := execute([]string{"--study", t.TempDir(), "scan"}); got != exitError {
		t.Errorf("scan outside a study: exit %d, want %d", got, exitError)
	}
	if got := execute([]string{"version"}); got != exitOK {
		t.Errorf("version: exit %d", got)
	}
}

// Every command's help carries a realistic example.
func TestEveryCommandHasAnExample(t *testing.T) {
	root := newRoot(&globals{})
	for _, c := range root.Commands() {
		if c.Name() == "help" || c.Name() == "completion" {
			continue
		}
		if strings.TrimSpace(c.Example) == "" {
			t.Errorf("quorate %s has no example", c.Name())
		}
	}
}

func TestInitScanStrict(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "st")
	arch := t.TempDir()
	os.WriteFile(filepath.Join(arch, "bad.edf"), []byte("0       garbage"), 0o644)
	if got := execute([]string{"--quiet", "init", dir, "--archive", arch}); got != exitOK {
		t.Fatalf("init: exit %d", got)
	}
	if got := execute([]string{"--quiet", "init", dir}); got != exitError {
		t.Errorf("second init: exit %d, want %d", got, exitError)
	}
	if got := execute([]string{"--quiet", "--study", dir, "scan"}); got != exitOK {
		t.Errorf("scan with a bad file: exit %d, want 0 (problems are listed, not fatal)", got)
	}
	if got := execute([]string{"--quiet", "--strict", "--study", dir, "scan"}); got != exitWarnings {
		t.Errorf("scan --strict with a bad file: exit %d, want %d", got, exitWarnings)
	}
	f, err := os.Open(filepath.Join(dir, study.ProvenanceFile))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var cmds []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		var e struct {
			Command string
			Outputs []struct{ Path, SHA256 string }
		}
		if err := json.Unmarshal(sc.Bytes(), &e); err != nil {
			t.Fatal(err)
		}
		cmds = append(cmds, e.Command)
		if e.Command == "scan" && len(e.Outputs) != 2 {
			t.Errorf("scan provenance lists %d outputs, want 2", len(e.Outputs))
		}
	}
	if strings.Join(cmds, ",") != "init,scan,scan" {
		t.Errorf("provenance commands %v", cmds)
	}
	secret, _ := os.ReadFile(filepath.Join(dir, ".quorate", "secret"))
	filepath.Walk(dir, func(p string, info os.FileInfo, err error) error {
		if err != nil || info.IsDir() || strings.Contains(p, ".quorate") {
			return nil
		}
		b, _ := os.ReadFile(p)
		if strings.Contains(string(b), strings.TrimSpace(string(secret))) {
			t.Errorf("%s contains the study secret", p)
		}
		return nil
	})
}

// runCLI takes the output streams as arguments: an error and its hint reach the
// injected stderr and nothing reaches stdout; the context given is the commands'.
func TestRunStreamsInjected(t *testing.T) {
	var out, errs bytes.Buffer
	if got := runCLI(context.Background(), []string{"--study", t.TempDir(), "scan"}, &out, &errs); got != exitError {
		t.Errorf("scan outside a study: exit %d, want %d", got, exitError)
	}
	if !strings.HasPrefix(errs.String(), "quorate: ") || out.Len() != 0 {
		t.Errorf("stderr %q, stdout %q", errs.String(), out.String())
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	dir := filepath.Join(t.TempDir(), "st")
	if got := runCLI(context.Background(), []string{"--quiet", "init", dir, "--archive", t.TempDir()}, &out, &errs); got != exitOK {
		t.Fatalf("init: exit %d: %s", got, errs.String())
	}
	errs.Reset()
	if got := runCLI(ctx, []string{"--quiet", "--study", dir, "scan"}, &out, &errs); got != exitError || !strings.Contains(errs.String(), context.Canceled.Error()) {
		t.Errorf("scan under a cancelled context: exit %d, stderr %q", got, errs.String())
	}
}
