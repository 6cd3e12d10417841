package main

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

// quorate demo once printed tune's warning as a raw log record ("time=… level=WARN
// msg=tune warning=…"). A warning is now one plain line, "warning: …", on stderr;
// the demo study's tune warns that it has fewer subjects than the folds asked for.
func TestWarningsArePlainLines(t *testing.T) {
	st := demoStudy(t) // runs the demo once, its stderr kept in demoLog
	check := func(what, log string) {
		t.Helper()
		if strings.Contains(log, "level=") || strings.Contains(log, "time=") || strings.Contains(log, "msg=") {
			t.Errorf("%s: a raw log record on stderr:\n%s", what, log)
		}
		found := false
		for _, line := range strings.Split(strings.TrimSpace(log), "\n") {
			if !strings.HasPrefix(line, "warning: ") && !strings.HasPrefix(line, "note: ") {
				t.Errorf("%s: stderr line %q is neither a warning nor a note", what, line)
			}
			found = found || strings.HasPrefix(line, "warning: ") && strings.Contains(line, "folds asked for")
		}
		if !found {
			t.Errorf("%s: no \"warning: …folds asked for…\" line on stderr:\n%s", what, log)
		}
	}
	check("demo", demoLog.String())

	// tune alone, with and without --quiet: warnings show either way.
	for _, quiet := range []bool{true, false} {
		var out, errs bytes.Buffer
		g := &globals{argv: []string{"quorate", "tune"}, stdout: &out, stderr: &errs}
		root := newRoot(g)
		args := []string{"--study", st, "tune"}
		if quiet {
			args = append([]string{"--quiet"}, args...)
		}
		root.SetArgs(args)
		if err := root.Execute(); err != nil {
			t.Fatal(err)
		}
		check("tune", errs.String())
	}

	// With --log-format json a warning is a JSON record, for a program reading logs.
	var out, errs bytes.Buffer
	root := newRoot(&globals{argv: []string{"quorate", "tune"}, stdout: &out, stderr: &errs})
	root.SetArgs([]string{"--quiet", "--log-format", "json", "--study", st, "tune"})
	if err := root.Execute(); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, line := range strings.Split(strings.TrimSpace(errs.String()), "\n") {
		var rec struct{ Level, Msg, Command string }
		if err := json.Unmarshal([]byte(line), &rec); err != nil {
			t.Fatalf("--log-format json: stderr line %q is not JSON: %v", line, err)
		}
		found = found || rec.Level == "WARN" && rec.Command == "tune" && strings.Contains(rec.Msg, "folds asked for")
	}
	if !found {
		t.Errorf("--log-format json: no WARN record of tune about folds:\n%s", errs.String())
	}
}
