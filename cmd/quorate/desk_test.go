package main

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// init --secret-file takes a known 256-bit key from a file only its owner
// can read, and refuses anything else.
func TestInitSecretFile(t *testing.T) {
	dir := t.TempDir()
	key := strings.Repeat("0123456789abcdef", 4) + "\n"
	write := func(name, body string, mode os.FileMode) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(body), mode)
		os.Chmod(p, mode)
		return p
	}
	good := write("good", key, 0o600)
	for name, p := range map[string]string{
		"world-readable": write("open", key, 0o644),
		"short":          write("short", key[:40], 0o600),
		"not hex":        write("nothex", strings.Repeat("z", 64), 0o600),
	} {
		if got := execute([]string{"--quiet", "init", filepath.Join(dir, "st-"+strings.ReplaceAll(name, " ", "")), "--secret-file", p}); got == exitOK {
			t.Errorf("%s secret file accepted", name)
		}
	}
	st := filepath.Join(dir, "study")
	if got := execute([]string{"--quiet", "init", st, "--secret-file", good}); got != exitOK {
		t.Fatalf("init --secret-file: exit %d", got)
	}
	b, err := os.ReadFile(filepath.Join(st, ".quorate", "secret"))
	if err != nil || string(b) != key {
		t.Errorf("stored secret %q, %v", b, err)
	}
}

func TestVersionFlag(t *testing.T) {
	if got := execute([]string{"--version"}); got != exitOK {
		t.Errorf("--version: exit %d", got)
	}
}

// An unknown flag points at the help of the command it was given to.
func TestUnknownFlagPointsAtCommandHelp(t *testing.T) {
	r, w, err := os.Pipe()
	if err != nil {
		t.Fatal(err)
	}
	old := os.Stderr
	os.Stderr = w
	code := execute([]string{"merge", "--no-such-flag", "x.json"})
	w.Close()
	os.Stderr = old
	b, _ := io.ReadAll(r)
	if code != exitUsage || !strings.Contains(string(b), "quorate merge --help") {
		t.Errorf("exit %d, stderr %q", code, b)
	}
}
