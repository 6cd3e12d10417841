// Package archive indexes an EEG archive: it finds the EDF, EDF+ and BDF recordings under
// a set of folders (by content, not by file name), summarises each in one row of
// index/recordings.parquet, and lists every file it could not index in
// index/problems.csv. It only ever reads the archive.
//
// A recording's id is derived from its content (SHA-256), so it is stable across moves
// and renames and a file found twice is recognised as a duplicate. A subject's key is a
// keyed hash (HMAC-SHA-256, RFC 2104) of the header's patient identification field with
// the study secret: recordings of one patient share a key, and the identification itself
// is never stored.
package archive
