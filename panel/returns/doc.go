// Package returns reads what raters send back from a rating packet — the
// JSON file saved by the review page or the filled sheet.csv — and checks it
// against the coordinator's manifest before any answer is used.
//
// Parse refuses a return unless it names a known packet of the study, its
// rater, and the packet's check value (compared in constant time), and
// unless every answer is complete and well formed; it reports every problem
// at once, so a rater can fix a sheet in one round. The formats are
// specified in FORMAT.md beside this file.
package returns
