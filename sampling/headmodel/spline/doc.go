// Package spline interpolates a scalp voltage map between electrodes with
// spherical splines (Perrin, Pernier, Bertrand & Echallier 1989), for the
// voltage maps shown to raters and for judging how smooth a field is.
package spline
