package main

import (
	"bytes"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"os"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
)

type initOptions struct {
	dir        string
	archives   []string
	seed       uint64
	secretFile string
}

func newInitCmd(g *globals) *cobra.Command {
	o := &initOptions{}
	cmd := &cobra.Command{
		Use:   "init DIR",
		Short: "Create a study folder with a commented protocol and a secret key",
		Long: `init creates DIR/study.yaml, the study's protocol (archive roots, montage, filters,
criterion defaults, draw design, panel roster, tie policy, tuning policy), and a 256-bit
secret in DIR/.quorate/secret (mode 0600) used to key subject keys and packet check values.
The secret is never printed nor copied into any output. init refuses to overwrite a study.

--secret-file gives a known secret instead (64 hexadecimal digits, the file readable by its
owner only), e.g. to re-create a study whose subject keys and check values must not change.
The draw does not depend on the secret: the same archive and --seed draw the same events.`,
		Example: `  quorate init /studies/ied-2027 --archive /mnt/eeg-archive/2024 --archive /mnt/eeg-archive/2025`,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.dir = args[0]
			if err := initStudy(o); err != nil {
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
	cmd.Flags().StringVar(&o.secretFile, "secret-file", "", "use the 256-bit secret in FILE (64 hex digits, mode 0600) instead of a new random one")
	return cmd
}

func initStudy(o *initOptions) error {
	if o.secretFile == "" {
		return study.Init(o.dir, o.archives, o.seed)
	}
	secret, err := readSecretFile(o.secretFile)
	if err != nil {
		return err
	}
	var id [8]byte
	if _, err := rand.Read(id[:]); err != nil {
		return err
	}
	return study.InitWith(o.dir, o.archives, o.seed, "st-"+hex.EncodeToString(id[:]), secret)
}

// readSecretFile reads a study secret given by the user: 64 hexadecimal
// digits (a 256-bit HMAC key, RFC 2104 §3: at least the hash's output
// length) in a file no one but its owner can read.
func readSecretFile(path string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, fmt.Errorf("--secret-file: %w", err)
	}
	if !st.Mode().IsRegular() || st.Size() > 1024 {
		return nil, fmt.Errorf("--secret-file %s: want a small regular file holding 64 hexadecimal digits", path)
	}
	if perm := st.Mode().Perm(); perm&0o077 != 0 {
		return nil, fmt.Errorf("--secret-file %s: mode %04o lets others read the secret; want 0600 (chmod 600 %s)", path, perm, path)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("--secret-file: %w", err)
	}
	k, err := hex.DecodeString(string(bytes.TrimSpace(b)))
	if err != nil || len(k) != 32 {
		return nil, fmt.Errorf("--secret-file %s: want 64 hexadecimal digits (a 256-bit key), got %d characters", path, len(bytes.TrimSpace(b)))
	}
	return k, nil
}
