package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"github.com/quorate-eeg/quorate/tuning"
	"go/ast"
	"go/token"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/export"
	"github.com/quorate-eeg/quorate/panel/packet"
)

// Every sentinel's message is in the domain's words and its hint in the command's.
func TestSentinelHints(t *testing.T) {
	for _, h := range sentinelHints {
		if cliWords(h.err.Error()) {
			t.Errorf("domain error %q names a command, a flag or study.yaml", h.err)
		}
		got := withHint(fmt.Errorf("some/path: %w", h.err))
		if !errors.Is(got, h.err) || !strings.Contains(got.Error(), h.err.Error()) || !cliWords(got.Error()) {
			t.Errorf("withHint(%v) = %q, want the domain message and a command or flag after it", h.err, got)
		}
	}
	for table := range stepOf {
		got := withHint(&export.MissingStepError{Table: table}).Error()
		if !strings.Contains(got, "no "+table) || !strings.Contains(got, "run "+stepOf[table]+" first") {
			t.Errorf("missing %s: %q", table, got)
		}
	}
	if got := withHint(&packet.ExistsError{Path: "p"}).Error(); !strings.Contains(got, "--replace") {
		t.Errorf("packets exist: %q", got)
	}
	if err := errors.New("plain"); withHint(err) != err {
		t.Error("an error without a hint is changed")
	}
}

// The hint reaches the user: draw on a study with no candidates says which command
// makes them, on the injected stderr.
func TestHintOnStderr(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "st")
	var out, errs bytes.Buffer
	if got := runCLI(context.Background(), []string{"--quiet", "init", dir, "--archive", t.TempDir()}, &out, &errs); got != exitOK {
		t.Fatalf("init: exit %d: %s", got, errs.String())
	}
	errs.Reset()
	if got := runCLI(context.Background(), []string{"--quiet", "--study", dir, "draw", "--n", "5"}, &out, &errs); got != exitError {
		t.Fatalf("draw without candidates: exit %d", got)
	}
	if !strings.Contains(errs.String(), "no candidate events; run quorate detect or quorate import-events first") {
		t.Errorf("stderr %q, want the missing input and the command that makes it", errs.String())
	}
}

// cliWords reports a string that names a quorate command, a flag or study.yaml.
func cliWords(s string) bool { return cliWordsRE.MatchString(s) }

var cliWordsRE = func() *regexp.Regexp {
	var names []string
	for _, c := range newRoot(&globals{}).Commands() {
		names = append(names, regexp.QuoteMeta(c.Name()))
	}
	return regexp.MustCompile(`quorate (` + strings.Join(names, "|") + `)\b|(^|[\s(])--[a-z]|study\.yaml`)
}()

// No string literal of a domain package (outside tests) names a command, a flag or
// study.yaml: those words belong to the command layer (hints.go).
func TestDomainStringsHaveNoCLIWords(t *testing.T) {
	eachSource(t, []string{"sampling", "panel", "tuning", "export", "internal"}, func(p string, _ *token.FileSet, f *ast.File) {
		ast.Inspect(f, func(n ast.Node) bool {
			if lit, ok := n.(*ast.BasicLit); ok && lit.Kind == token.STRING {
				if s, err := strconv.Unquote(lit.Value); err == nil && cliWords(s) {
					t.Errorf("%s: %q names a command, a flag or study.yaml", p, s)
				}
			}
			return true
		})
	})
}

// A tuning option out of range names the tune flag that sets it; an unusable event
// gets no flag advice (no flag fixes a row).
func TestTuningOptionHints(t *testing.T) {
	if h := hintFor(&tuning.InputError{Index: -1, Field: "Folds", Msg: "1 folds"}); h != "change --folds" {
		t.Errorf("Folds: hint %q", h)
	}
	if h := hintFor(&tuning.InputError{Index: 3, EventID: "ev-1", Field: "Weight", Msg: "NaN"}); h != "" {
		t.Errorf("an event's field: hint %q, want none", h)
	}
}
