// Package packet builds blinded rating packets: one self-contained review
// page and one equivalent spreadsheet per rater, a coordinator-only key that
// maps opaque item codes back to events, and a manifest that lets the returns
// parser match and verify what raters send back.
//
// A packet carries only what a rater needs to judge the IFCN criteria for an
// interictal epileptiform discharge (Kane et al. 2017, Clin Neurophysiol
// Pract 2:170–185; page range from memory): the traces of a window centred
// on the event, the montages to view them in, and a voltage map at the peak. Subject, recording, file, date,
// time of day, detector score, feature values, stratum and other raters'
// answers never reach a packet; each rater sees the items in an independent
// seeded order under codes derived by HMAC-SHA256 (RFC 2104, FIPS 180-4), so
// codes are unguessable without the study secret yet stable across rebuilds.
package packet
