package main

import (
	"fmt"
	"runtime"

	"github.com/spf13/cobra"
)

func newVersionCmd(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:     "version",
		Short:   "Print quorate's version",
		Example: "  quorate version",
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			fmt.Fprintln(g.stdout, versionLine())
			return nil
		},
	}
}

// versionLine is what both `quorate version` and `quorate --version` print.
func versionLine() string {
	return fmt.Sprintf("quorate %s (%s, %s/%s)", Version, runtime.Version(), runtime.GOOS, runtime.GOARCH)
}
