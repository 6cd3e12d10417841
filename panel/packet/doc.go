// Package packet builds blinded rating packets: one self-contained review
// page and one equivalent spreadsheet per rater, a coordinator-only key that
// maps opaque item codes back to events, and a manifest that lets the returns
// parser match and verify what raters send back.
//
// A packet carries only what a rater needs to judge the IFCN criteria for an
// interictal epileptiform discharge (Kane et al. 2017, Clin Neurophysiol
// Pract 2:170–185; page range from memory): the traces of a window centred
// on the event with context either side, the montages to view them in, and a
// voltage map at the peak. Subject, recording, file, date, time of day,
// detector score, feature values, stratum and other raters' answers never
// reach a packet; each rater sees the items in an independent seeded order
// under codes derived by HMAC-SHA256 (RFC 2104, FIPS 180-4), so codes are
// unguessable without the study secret yet stable across rebuilds.
//
// The page (assets/) filters in the browser rather than at build time: the
// traces are packed as recorded, and the page runs second-order Butterworth
// high- and low-pass sections and a notch (bilinear transform with
// pre-warping) forward and backward, opening with Options.Filters and
// stating the filters in force. One packed copy thus serves every filter
// setting a rater may choose, and the filters on screen are the filters
// applied. Answers per criterion and for the verdict are "present"/"absent"
// (verdict "epileptiform"/"not-epileptiform") or "cannot-judge".
package packet
