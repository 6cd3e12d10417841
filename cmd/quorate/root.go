package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"os"
	"runtime"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	cautionText "github.com/quorate-eeg/quorate/internal/caution"
)

// Version is set at build time with -ldflags "-X main.Version=…".
var Version = "0.1.0-dev"

// Exit codes.
const (
	exitOK       = 0
	exitError    = 1
	exitUsage    = 2
	exitWarnings = 3
)

// globals are the flags every command shares.
type globals struct {
	study     string
	workers   int
	quiet     bool
	strict    bool
	logFormat string
	log       *slog.Logger
	argv      []string
	stdout    io.Writer
	stderr    io.Writer // logs and errors; os.Stderr when nil
	force     bool      // go on although a stage before the command is stale
}

type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

// warningsError ends a run that finished but met warnings under --strict.
type warningsError struct{ n int }

func (e warningsError) Error() string {
	return fmt.Sprintf("finished with %d warning(s) and --strict is set", e.n)
}

var caution = wrap(cautionText.Text, 90)

func newRoot(g *globals) *cobra.Command {
	root := &cobra.Command{
		Version: Version,
		Use:     "quorate",
		Short:   "From an EEG archive to a locally tuned IED detector operating point",
		Long: `quorate helps an epilepsy centre build a local reference set of interictal epileptiform
discharges (IEDs) rated against the six IFCN criteria, and tune detector cutoffs on it:
scan the archive, detect candidates, draw a stratified sample, send blinded packets to a
panel, merge the ratings into a gold standard, tune, and export.

` + caution,
		Example: `  quorate init my-study --archive /data/eeg
  quorate --study my-study scan
  quorate demo --out /tmp/quorate-demo`,
		SilenceUsage:  true,
		SilenceErrors: true,
		PersistentPreRunE: func(cmd *cobra.Command, args []string) error {
			var h slog.Handler
			opts := &slog.HandlerOptions{Level: slog.LevelInfo}
			if g.quiet {
				opts.Level = slog.LevelWarn
			}
			switch g.logFormat {
			case "text":
				h = slog.NewTextHandler(g.errOut(), opts)
			case "json":
				h = slog.NewJSONHandler(g.errOut(), opts)
			default:
				return usageError{fmt.Errorf("--log-format: got %q, want text or json", g.logFormat)}
			}
			if g.workers < 1 {
				return usageError{fmt.Errorf("--workers: got %d, want at least 1", g.workers)}
			}
			g.log = slog.New(h)
			return nil
		},
	}
	pf := root.PersistentFlags()
	pf.StringVar(&g.study, "study", ".", "study folder (made by quorate init)")
	pf.IntVar(&g.workers, "workers", runtime.NumCPU(), "parallel workers")
	pf.BoolVar(&g.quiet, "quiet", false, "no progress bars, warnings and errors only")
	pf.BoolVar(&g.strict, "strict", false, "exit with code 3 when a command finishes with warnings")
	pf.StringVar(&g.logFormat, "log-format", "text", "warnings and notes on stderr: text (plain \"warning: …\" lines) or json (one record each)")
	pf.BoolVar(&g.force, "force", false, "go on although an earlier stage's outputs are of another generation than its inputs")
	root.SetVersionTemplate(versionLine() + "\n")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error { return usageError{err} })

	// Commands are listed in the order a study runs them, not alphabetically.
	cobra.EnableCommandSorting = false
	root.AddCommand(
		newInitCmd(g),
		newScanCmd(g),
		newDetectCmd(g),
		newImportEventsCmd(g),
		newPlanCmd(g),
		newDrawCmd(g),
		newPacketsCmd(g),
		newMergeCmd(g),
		newStatusCmd(g),
		newCheckCmd(g),
		newTuneCmd(g),
		newExportCmd(g),
		newDemoCmd(g),
		newVersionCmd(g),
	)
	for _, c := range root.Commands() {
		guard(g, c)
	}
	return root
}

// execute runs the CLI on the process's standard streams and maps the outcome to an exit code.
func execute(args []string) int {
	return runCLI(context.Background(), args, os.Stdout, os.Stderr)
}

// runCLI runs the CLI with its output on stdout and its logs, warnings and errors
// on stderr, under ctx, and maps the outcome to an exit code.
func runCLI(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	g := &globals{argv: append([]string{"quorate"}, args...), stdout: stdout, stderr: stderr}
	root := newRoot(g)
	root.SetArgs(args)
	root.SetOut(stdout)
	root.SetErr(stderr)
	cmd, err := root.ExecuteContextC(ctx)
	if err == nil {
		return exitOK
	}
	err = withHint(err)
	fmt.Fprintln(g.errOut(), "quorate:", err)
	var ue usageError
	var we warningsError
	switch {
	case errors.As(err, &ue) || isCobraUsage(err):
		// An unknown flag or a wrong argument count points at the help of the command it was given to.
		fmt.Fprintf(g.errOut(), "Run '%s --help' for usage.\n", cmd.CommandPath())
		return exitUsage
	case errors.As(err, &we):
		return exitWarnings
	default:
		return exitError
	}
}

// isCobraUsage recognises the argument errors cobra raises itself (unknown command,
// wrong number of arguments), which carry no type of their own.
func isCobraUsage(err error) bool {
	msg := err.Error()
	for _, p := range []string{"unknown command", "accepts ", "requires at least", "requires at most", "unknown flag", "unknown shorthand"} {
		if strings.Contains(msg, p) {
			return true
		}
	}
	return false
}

// errOut is where logs and errors go.
func (g *globals) errOut() io.Writer {
	if g.stderr == nil {
		return os.Stderr
	}
	return g.stderr
}

// openStudy opens the study named by --study.
func (g *globals) openStudy() (*study.Study, error) {
	s, err := study.Open(g.study)
	if err != nil {
		return nil, err
	}
	s.Stages = pipeline
	return s, nil
}

// finish applies --strict to a run's warning count.
func (g *globals) finish(warnings int) error {
	if g.strict && warnings > 0 {
		return warningsError{warnings}
	}
	return nil
}

// wrap breaks text into lines of at most width characters, at spaces.
func wrap(text string, width int) string {
	var b strings.Builder
	n := 0
	for i, w := range strings.Fields(text) {
		if i > 0 {
			if n+1+len(w) > width {
				b.WriteByte('\n')
				n = 0
			} else {
				b.WriteByte(' ')
				n++
			}
		}
		b.WriteString(w)
		n += len(w)
	}
	return b.String()
}
