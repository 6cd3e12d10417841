package export

import (
	"encoding/json"
	"fmt"
	"io"
	"sort"
	"strings"
)

// Dictionary is what data-dictionary.md and schema.json say about an export.
type Dictionary struct {
	Format         string `json:"format"`
	Missing        string `json:"missing_value"` // how a missing value is written in text tables
	DatesShifted   bool   `json:"dates_shifted"`
	OperatingPoint string `json:"operating_point_rule,omitempty"`
	// OperatingPointHeadline is the rule's figures to expect on new recordings.
	OperatingPointHeadline string  `json:"operating_point_headline,omitempty"`
	EpochWindowS           float64 `json:"epoch_window_s,omitempty"`
	EpochMontage           string  `json:"epoch_montage,omitempty"`
	Tables                 []Table `json:"tables"`
}

// HeadlineExplained says in plain words what an operating point's headline
// figures are.
const HeadlineExplained = "The rule was chosen on the rated events, so its figures on those events flatter it. " +
	"The headline repeats the whole choice on subjects drawn again at random from the study, measures how much each repeat flattered its own choice, " +
	"and takes that average flattery off; the interval is the range those repeats make plausible (optimism-corrected bootstrap, Harrell, Lee & Mark 1996). " +
	"Figures are design-weighted: they describe the archive, not the enriched sample."

func writeSchemaJSON(w io.Writer, d *Dictionary) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(d)
}

// formulaNote explains the quote FormulaSafe puts before some text cells.
const formulaNote = "A text cell that begins with `=`, `+`, `-`, `@`, a tab or a carriage return is written with a leading `'` so that a spreadsheet shows it as text instead of running it as a formula (OWASP, CSV Injection); remove that one character to get the value back. Numbers are never quoted."

func writeDictionaryMD(w io.Writer, d *Dictionary) error {
	var b strings.Builder
	fmt.Fprintf(&b, "# Data dictionary\n\n> %s\n\nExported by quorate as %s. ", Caution, d.Format)
	switch d.Format {
	case "parquet":
		b.WriteString("Missing values are Parquet nulls; booleans are Parquet booleans.\n")
	case "csv":
		b.WriteString("Files are UTF-8, RFC 4180 CSV with a header row; numbers use a dot as decimal mark; booleans are `true`/`false`; a missing value is an empty cell; list columns separate their elements with `;`. " + formulaNote + "\n")
	case "bids":
		b.WriteString("Tab-separated files follow BIDS: a missing value is `n/a`; booleans are `true`/`false`; list columns separate their elements with `;`. " + formulaNote + "\n")
	}
	b.WriteString("\nNo table holds a patient's identification, a file or folder name or an archive path: recordings are named by a hash of their content, subjects by a keyed hash.\n")
	if d.DatesShifted {
		b.WriteString("\nDates are shifted per subject by a secret whole number of days; intervals between one subject's recordings are kept.\n")
	} else {
		b.WriteString("\nCalendar dates are not exported; only the year and the time of day of each recording's start.\n")
	}
	if d.OperatingPoint != "" {
		fmt.Fprintf(&b, "\nThe operating point in `op_decision` is the rule `%s`.\n", d.OperatingPoint)
		if d.OperatingPointHeadline != "" {
			fmt.Fprintf(&b, "\nTo expect of it on new recordings like these: %s. %s\n", d.OperatingPointHeadline, HeadlineExplained)
		}
	}
	if d.EpochMontage != "" {
		fmt.Fprintf(&b, "\nEpochs are %g s windows centred on each event, in the %s montage.\n", d.EpochWindowS, d.EpochMontage)
	}
	for _, t := range d.Tables {
		fmt.Fprintf(&b, "\n## %s (`%s`)\n\n%s\n\n| column | type | nullable | unit | meaning |\n|---|---|---|---|---|\n", t.Name, t.File, t.Description)
		for _, c := range t.Columns {
			meaning := c.Description
			if len(c.Levels) > 0 {
				keys := make([]string, 0, len(c.Levels))
				for k := range c.Levels {
					keys = append(keys, k)
				}
				sort.Strings(keys)
				var lv []string
				for _, k := range keys {
					if c.Levels[k] != "" {
						lv = append(lv, fmt.Sprintf("`%s` %s", k, c.Levels[k]))
					} else {
						lv = append(lv, "`"+k+"`")
					}
				}
				meaning += " Levels: " + strings.Join(lv, "; ") + "."
			}
			nullable := "no"
			if c.Nullable {
				nullable = "yes"
			}
			fmt.Fprintf(&b, "| `%s` | %s | %s | %s | %s |\n", c.Name, c.Type, nullable, c.Unit, strings.ReplaceAll(meaning, "|", "\\|"))
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}
