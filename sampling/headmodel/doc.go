// Package headmodel models the head as a set of concentric conducting
// spheres carrying scalp electrodes, so that an interictal discharge can be
// described by an equivalent current dipole: where the 10-10 electrodes sit
// (Jasper 1958; Chatrian, Lettich & Nelson 1985; Oostenveld & Praamstra
// 2001), what potential a dipole produces at them (Frank 1952; Brody, Terry
// & Ideker 1973; Rush & Driscoll 1968; de Munck & Peters 1993; Berg &
// Scherg 1994), and which single dipole best explains a voltage map
// (IFCN criterion 6, Kane et al. 2017).
//
// Units are SI throughout: metres, ampere-metres, siemens per metre, volts.
// The head frame has x to the right, y anterior (towards the nasion) and z
// up, with the origin at the centre of the spheres.
package headmodel
