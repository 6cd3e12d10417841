// Package synth generates synthetic scalp EEG for a fictional centre together
// with a truth table, so that candidate finding, the six IFCN criterion
// features, panel simulation and operating-point tuning can be checked
// against known ground truth.
//
// A recording is ongoing background (1/f activity mixed through an injected
// forward model, a waxing and waning posterior alpha rhythm, drowsy theta)
// plus scheduled events: true interictal epileptiform discharges (IEDs) built
// from dipolar sources, and look-alikes each built to meet only some of the
// criteria of Kane et al. (2017), "A revised glossary of terms most commonly
// used by clinical electroencephalographers and updated proposal for the
// report format of the EEG findings. Revision 2017", Clin Neurophysiol Pract
// 2:170–185. Every event records which criteria (c1..c6) it was built to meet.
//
// Generation is deterministic given Config.Seed, and independent of the
// chunk size used when streaming. See GENERATOR.md for each event kind.
package synth
