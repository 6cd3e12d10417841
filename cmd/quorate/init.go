package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
)

type initOptions struct {
	dir      string
	archives []string
	seed     uint64
}

func newInitCmd(g *globals) *cobra.Command {
	o := &initOptions{}
	cmd := &cobra.Command{
		Use:   "init DIR",
		Short: "Create a study folder with a commented protocol and a secret key",
		Long: `init creates DIR/study.yaml, the study's protocol (archive roots, montage, filters,
criterion defaults, draw design, panel roster, tie policy, tuning policy), and a 256-bit
secret in DIR/.quorate/secret (mode 0600) used to key subject keys and packet check values.
The secret is never printed nor copied into any output. init refuses to overwrite a study.`,
		Example: `  quorate init /studies/ied-2027 --archive /mnt/eeg-archive/2024 --archive /mnt/eeg-archive/2025`,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.dir = args[0]
			if err := study.Init(o.dir, o.archives, o.seed); err != nil {
				return err
			}
			s, err := study.Open(o.dir)
			if err != nil {
				return err
			}
			seed := o.seed
			if err := s.Record(study.Entry{Version: Version, Command: "init", Argv: g.argv, Seed: &seed,
				Outputs: s.Hash(s.Path(study.ConfigFile))}); err != nil {
				return err
			}
			fmt.Fprintf(g.stdout, "Created study %s in %s. Edit %s, then run: quorate --study %s scan\n",
				s.Config.Study.ID, o.dir, s.Path(study.ConfigFile), o.dir)
			return nil
		},
	}
	cmd.Flags().StringArrayVar(&o.archives, "archive", nil, "archive root folder to scan (repeatable)")
	cmd.Flags().Uint64Var(&o.seed, "seed", 1, "the study's default random seed")
	return cmd
}
