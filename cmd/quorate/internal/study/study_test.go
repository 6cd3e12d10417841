package study

import (
	"bufio"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestInitOpen(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "my-study")
	arch := t.TempDir()
	if err := Init(dir, []string{arch}, 7); err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(filepath.Join(dir, SecretFile))
	if err != nil {
		t.Fatal(err)
	}
	if st.Mode().Perm() != 0o600 {
		t.Errorf("secret mode %v, want 0600", st.Mode().Perm())
	}
	s, err := Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Config.Archive.Roots; len(got) != 1 || got[0] != arch {
		t.Errorf("roots %v, want [%s]", got, arch)
	}
	if s.Config.Seed != 7 || s.Config.Signal.NotchHz != 50 || s.Config.Panel.Tie != "absent" {
		t.Errorf("defaults not read back: %+v", s.Config)
	}
	k, err := s.Secret()
	if err != nil || len(k) != 32 {
		t.Fatalf("secret: %v len %d, want 32 bytes", err, len(k))
	}
	y, _ := os.ReadFile(filepath.Join(dir, ConfigFile))
	sec, _ := os.ReadFile(filepath.Join(dir, SecretFile))
	if strings.Contains(string(y), strings.TrimSpace(string(sec))) {
		t.Error("study.yaml contains the secret")
	}
	if err := Init(dir, nil, 1); !errors.Is(err, ErrExists) {
		t.Errorf("second init: %v, want ErrExists", err)
	}
}

func TestConfigRefusesUnknownAndBadFields(t *testing.T) {
	dir := t.TempDir()
	if err := Init(dir, nil, 1); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, ConfigFile)
	y, _ := os.ReadFile(p)
	os.WriteFile(p, []byte(strings.Replace(string(y), "tie: absent", "tie: coin", 1)), 0o644)
	_, err := ReadConfig(p)
	var ce *ConfigError
	if !errors.As(err, &ce) || ce.Field != "panel.tie" {
		t.Fatalf("err = %v, want a ConfigError on panel.tie", err)
	}
	os.WriteFile(p, []byte(string(y)+"\nsurprise: 1\n"), 0o644)
	if _, err := ReadConfig(p); err == nil || !strings.Contains(err.Error(), "surprise") {
		t.Fatalf("unknown field accepted: %v", err)
	}
}

func TestRecordAppends(t *testing.T) {
	dir := t.TempDir()
	if err := Init(dir, nil, 1); err != nil {
		t.Fatal(err)
	}
	s, _ := Open(dir)
	out := s.Path("index", "x.txt")
	os.MkdirAll(filepath.Dir(out), 0o755)
	os.WriteFile(out, []byte("abc"), 0o644)
	for i := 0; i < 2; i++ {
		if err := s.Record(Entry{Command: "scan", Outputs: s.Hash(out)}); err != nil {
			t.Fatal(err)
		}
	}
	f, _ := os.Open(s.Path(ProvenanceFile))
	defer f.Close()
	sc := bufio.NewScanner(f)
	n := 0
	for sc.Scan() {
		var e Entry
		if err := json.Unmarshal(sc.Bytes(), &e); err != nil {
			t.Fatal(err)
		}
		// SHA-256("abc"), FIPS 180-2 Appendix B.1.
		if e.Outputs[0].SHA256 != "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" || e.Outputs[0].Path != "index/x.txt" {
			t.Errorf("output hash %+v", e.Outputs[0])
		}
		n++
	}
	if n != 2 {
		t.Fatalf("%d lines, want 2", n)
	}
}
