package study

import (
	"bytes"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// The fixed places of a study's artefacts, relative to the study folder.
const (
	ConfigFile = "study.yaml"
	SecretFile = ".quorate/secret"
	// PathsFile keeps each recording's archive path (names often carry a patient's
	// name): private to the study, like the secret, and read by no export.
	PathsFile      = ".quorate/paths.json"
	ProvenanceFile = "provenance.jsonl"
	IndexDir       = "index"
	CandidatesDir  = "candidates"
	DrawDir        = "draw"
	PacketsDir     = "packets"
	ReturnsDir     = "returns"
	ConsensusDir   = "consensus"
	TuningDir      = "tuning"
)

// Study is an opened study folder.
type Study struct {
	Dir    string
	Config *Config
	// Stages are the study's steps in pipeline order; a command that is one of them
	// records its generation in Record, and Stale checks those before a command.
	Stages []Stage
	secret []byte
}

// ErrExists is returned by Init when the folder already holds a study.
var ErrExists = errors.New("a study already exists here")

// Init creates a study in dir: the commented protocol and a 256-bit secret readable by
// the owner only. It refuses to touch a folder that already has a study.
func Init(dir string, roots []string, seed uint64) error {
	var idb [8]byte
	if _, err := rand.Read(idb[:]); err != nil {
		return err
	}
	var secret [32]byte
	if _, err := rand.Read(secret[:]); err != nil {
		return err
	}
	return InitWith(dir, roots, seed, "st-"+hex.EncodeToString(idb[:]), secret[:])
}

// InitWith is Init with a given study id and secret. Only the demo uses it, so that a
// fictional study is the same for the same seed; a real study's secret must be random.
func InitWith(dir string, roots []string, seed uint64, id string, secret []byte) error {
	if _, err := os.Stat(filepath.Join(dir, ConfigFile)); err == nil {
		return fmt.Errorf("%s: %w (remove study.yaml by hand to start over)", dir, ErrExists)
	}
	if _, err := os.Stat(filepath.Join(dir, SecretFile)); err == nil {
		return fmt.Errorf("%s: %w (.quorate/secret is present)", dir, ErrExists)
	}
	abs := make([]string, len(roots))
	for i, r := range roots {
		a, err := filepath.Abs(r)
		if err != nil {
			return err
		}
		st, err := os.Stat(a)
		if err != nil {
			return fmt.Errorf("archive root %s: %w", r, err)
		}
		if !st.IsDir() {
			return fmt.Errorf("archive root %s: not a folder", r)
		}
		abs[i] = a
	}
	if len(secret) != 32 {
		return fmt.Errorf("study secret: %d bytes, want 32", len(secret))
	}
	var buf bytes.Buffer
	err := protocolTemplate.Execute(&buf, map[string]any{
		"ID": id, "Name": filepath.Base(dir), "Roots": abs, "Seed": seed,
	})
	if err != nil {
		return err
	}
	if err := os.MkdirAll(filepath.Join(dir, ".quorate"), 0o700); err != nil {
		return err
	}
	if err := atomicfile.Create(filepath.Join(dir, SecretFile), []byte(hex.EncodeToString(secret)+"\n"), 0o600); err != nil {
		return err
	}
	return atomicfile.Create(filepath.Join(dir, ConfigFile), buf.Bytes(), 0o644)
}

// Open reads the study in dir.
func Open(dir string) (*Study, error) {
	p := filepath.Join(dir, ConfigFile)
	if _, err := os.Stat(p); err != nil {
		return nil, fmt.Errorf("%s is not a study folder (no %s; create one with quorate init): %w", dir, ConfigFile, err)
	}
	c, err := ReadConfig(p)
	if err != nil {
		return nil, err
	}
	return &Study{Dir: dir, Config: c}, nil
}

// Path joins parts under the study folder.
func (s *Study) Path(parts ...string) string {
	return filepath.Join(append([]string{s.Dir}, parts...)...)
}

// Secret returns the study's 32-byte key. It is used only as an HMAC key (subject keys,
// packet check values, item codes) and is never printed or copied into an output.
func (s *Study) Secret() ([]byte, error) {
	if s.secret != nil {
		return s.secret, nil
	}
	p := s.Path(SecretFile)
	b, err := os.ReadFile(p)
	if err != nil {
		return nil, fmt.Errorf("study secret: %w", err)
	}
	k, err := hex.DecodeString(string(bytes.TrimSpace(b)))
	if err != nil || len(k) != 32 {
		return nil, fmt.Errorf("%s: want 64 hexadecimal digits (a 256-bit key)", p)
	}
	s.secret = k
	return k, nil
}
