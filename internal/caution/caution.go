// Package caution holds the one caution every report, summary and data dictionary of
// quorate carries, worded once.
package caution

// Text is the caution, in one line.
const Text = "quorate is a research and quality tool, not a diagnostic device. Validate any operating point locally; clinical decisions rest with qualified clinicians; follow local rules on data protection."
