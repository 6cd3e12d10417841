package study

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// GenerationsFile records, per stage, the digests of the inputs its outputs were built
// from, so that a later command can tell outputs of one generation from a mix.
const GenerationsFile = ".quorate/generations.json"

// Stage is one step of the study whose outputs depend on earlier artefacts.
type Stage struct {
	Name   string   // the command that runs it, e.g. "packets"
	Inputs []string // files or folders, relative to the study folder
	// Outputs are the files or folders the stage alone writes; a change to them after
	// the stage ran (an edit by hand, a file restored from elsewhere) is found too.
	Outputs []string
	Refresh string // the command line that rebuilds its outputs
}

// Generation is what a stage's last run was built from: each input's digest
// (DigestOf), "" for an input that was absent.
type Generation struct {
	Time    time.Time         `json:"time"`
	Argv    []string          `json:"argv"`
	Inputs  map[string]string `json:"inputs"`
	Outputs map[string]string `json:"outputs,omitempty"`
}

// StaleError reports a stage whose outputs were built from inputs that have changed
// since, or an input that cannot be read.
type StaleError struct {
	Stage   string // the stale stage
	Input   string // the input that changed
	Refresh string // the command that rebuilds the stage
	Err     error  // a read error, when the input could not be hashed
	Output  bool   // Input is one of the stage's outputs, changed after it wrote it
}

func (e *StaleError) Error() string {
	if e.Err != nil {
		return fmt.Sprintf("cannot check whether %s is up to date: %v", e.Stage, e.Err)
	}
	if e.Output {
		return fmt.Sprintf("%s changed after %s wrote it; run %s first to rebuild it (or pass --force to go on with it as it is)",
			e.Input, e.Stage, e.Refresh)
	}
	return fmt.Sprintf("the outputs of %s were built from an earlier %s; run %s first (or pass --force to go on with inputs of different generations)",
		e.Stage, e.Input, e.Refresh)
}

func (e *StaleError) Unwrap() error { return e.Err }

// DigestOf is one SHA-256 over every file under the study-relative path p (a file or a
// folder): the sorted lines "path sha256". An absent path digests to "".
func (s *Study) DigestOf(p string) (string, error) {
	if _, err := os.Lstat(s.Path(p)); errors.Is(err, os.ErrNotExist) {
		return "", nil
	}
	hs, err := s.HashAll(s.Path(p))
	if err != nil {
		return "", err
	}
	h := sha256.New()
	for _, f := range hs {
		fmt.Fprintf(h, "%s %s\n", f.Path, f.SHA256)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// ReadGenerations reads GenerationsFile; a study without one has none recorded.
func (s *Study) ReadGenerations() (map[string]Generation, error) {
	b, err := os.ReadFile(s.Path(GenerationsFile))
	if errors.Is(err, os.ErrNotExist) {
		return map[string]Generation{}, nil
	}
	if err != nil {
		return nil, err
	}
	g := map[string]Generation{}
	if err := json.Unmarshal(b, &g); err != nil {
		return nil, fmt.Errorf("%s: %w", s.Path(GenerationsFile), err)
	}
	return g, nil
}

// recordGeneration stores the digests of stage's inputs as they are now, right after
// the stage has run under the study's lock.
func (s *Study) recordGeneration(st Stage, argv []string) error {
	gens, err := s.ReadGenerations()
	if err != nil {
		return err
	}
	g := Generation{Time: time.Now().UTC(), Argv: argv, Inputs: map[string]string{}, Outputs: map[string]string{}}
	for _, in := range st.Inputs {
		if g.Inputs[in], err = s.DigestOf(in); err != nil {
			return err
		}
	}
	for _, out := range st.Outputs {
		if g.Outputs[out], err = s.DigestOf(out); err != nil {
			return err
		}
	}
	gens[st.Name] = g
	b, err := json.MarshalIndent(gens, "", "  ")
	if err != nil {
		return err
	}
	return atomicfile.WriteBytes(s.Path(GenerationsFile), append(b, '\n'), 0o644)
}

// Stale lists, in pipeline order, every recorded stage before command whose inputs have
// changed since it ran (all recorded stages when command is ""). A stage never run is
// not stale: the command that needs its outputs says they are missing.
func (s *Study) Stale(command string) ([]*StaleError, error) {
	gens, err := s.ReadGenerations()
	if err != nil {
		return nil, err
	}
	var out []*StaleError
	for _, st := range s.Stages {
		if st.Name == command {
			break
		}
		g, ok := gens[st.Name]
		if !ok {
			continue
		}
		if e := s.changed(st, st.Inputs, g.Inputs, false); e != nil {
			out = append(out, e)
		} else if e := s.changed(st, st.Outputs, g.Outputs, true); e != nil {
			out = append(out, e)
		}
	}
	return out, nil
}

// changed returns a StaleError for the first of paths whose digest is not the recorded
// one (outputs recorded before outputs were kept are not compared).
func (s *Study) changed(st Stage, paths []string, recorded map[string]string, output bool) *StaleError {
	for _, p := range paths {
		want, ok := recorded[p]
		if !ok && output {
			continue
		}
		d, err := s.DigestOf(p)
		if err != nil {
			return &StaleError{Stage: st.Name, Input: p, Refresh: st.Refresh, Err: err, Output: output}
		}
		if d != want {
			return &StaleError{Stage: st.Name, Input: p, Refresh: st.Refresh, Output: output}
		}
	}
	return nil
}

// CheckFresh refuses, with the first StaleError, when a stage before command is stale.
func (s *Study) CheckFresh(command string) error {
	st, err := s.Stale(command)
	if err != nil {
		return err
	}
	if len(st) > 0 {
		return st[0]
	}
	return nil
}

// stageNamed returns the stage a command runs, if it is one.
func (s *Study) stageNamed(command string) (Stage, bool) {
	for _, st := range s.Stages {
		if st.Name == command {
			return st, true
		}
	}
	return Stage{}, false
}
