package main

import (
	"context"
	"fmt"
	"log/slog"
)

// warn tells the person at the terminal about something that did not stop the
// command, as one plain line on stderr: "warning: " and the message. Warnings are
// shown under --quiet too. With --log-format json a warning is a JSON log record
// (level WARN, the command in "command"), for a program that reads the logs.
func (g *globals) warn(command, format string, a ...any) {
	g.say(slog.LevelWarn, "warning", command, fmt.Sprintf(format, a...))
}

// note is an informational line on stderr ("note: …"), hidden under --quiet; a JSON
// log record (level INFO) with --log-format json.
func (g *globals) note(command, format string, a ...any) {
	g.say(slog.LevelInfo, "note", command, fmt.Sprintf(format, a...))
}

func (g *globals) say(level slog.Level, label, command, msg string) {
	if g.logFormat == "json" && g.log != nil {
		g.log.Log(context.Background(), level, msg, "command", command)
		return
	}
	if level < slog.LevelWarn && g.quiet {
		return
	}
	fmt.Fprintf(g.errOut(), "%s: %s\n", label, msg)
}
