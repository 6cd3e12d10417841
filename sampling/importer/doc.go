// Package importer brings a team's own detector events into the candidate table: it
// reads their onsets from a CSV/TSV file, a BIDS events.tsv file or the EDF+ annotations
// of the archive recordings, ties each to an indexed recording, has the six IFCN criterion
// features (Kane et al. 2017) measured at those onsets like built-in candidates, and
// writes them under candidates/import=<source>/ marked with their source.
//
// Rows that cannot be used are never dropped silently: each one is listed, with the file,
// line, field and what was expected, in Result.Rejected and in rejected.csv beside the
// imported tables.
package importer
