// Package montage turns a recording's electrodes into the derivations a
// reader looks at: referential, common average, longitudinal bipolar and
// transverse bipolar montages, built from whichever 10-10 electrodes are
// present and usable, and degrading with a warning when some are not.
//
// Electrode names follow the 10-10 system (American Clinical
// Neurophysiology Society Guideline 2, Acharya et al. 2016, J Clin
// Neurophysiol 33(4):308–311; Oostenveld & Praamstra 2001, Clin
// Neurophysiol 112:713–719). Bipolar chains follow ACNS Guideline 3
// (Acharya et al. 2016, "A proposal for standard montages to be used in
// clinical EEG", J Clin Neurophysiol 33(4):312–316). The package also
// flags flat and saturated channels so callers can mark them bad.
package montage
