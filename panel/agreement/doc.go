// Package agreement measures how far a panel of raters agrees on the
// nominal answers recorded in blinded rating packets.
//
// The data model is a Table of items × raters holding category indices
// 0..K−1 or Missing. Most chance-corrected coefficients (observed agreement,
// Fleiss' kappa, Gwet's AC1, Krippendorff's alpha) depend on an item only
// through its category counts n_ik, so they are computed from Counts, and
// through Counts from weighted Totals. Item weights are what make the cluster
// bootstrap cheap: resampling subjects is a multinomial weight on each
// subject's pooled Totals, with no table ever rebuilt.
package agreement
