// Package merge takes raters' returns back into the study: it checks each file against
// the packet manifest, stores every accepted file unchanged under returns/ (named by its
// SHA-256, read-only, never overwritten), keeps an append-only ledger of what was merged
// and which return counts, and rebuilds the consensus tables and the agreement report
// from the returns that count.
//
// A later return of the same packet supersedes the earlier one; both stay stored and the
// ledger says which counts. A rejected file is reported with every problem and changes
// nothing.
package merge
