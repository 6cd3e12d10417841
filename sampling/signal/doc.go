// Package signal conditions EEG samples with recursive (IIR) filters held as
// cascades of second-order sections: Butterworth low-pass, high-pass,
// band-pass and band-stop designs, a mains notch, zero-phase forward–backward
// filtering, and windowed filtering of long recordings in bounded memory.
//
// Designs follow the analogue-prototype route of Oppenheim & Schafer,
// Discrete-Time Signal Processing (3rd ed., 2010), §7.1–7.3: poles of the
// normalised Butterworth prototype (Butterworth 1930, "On the theory of filter
// amplifiers", Wireless Engineer 7:536–541), an analogue frequency
// transformation, and the bilinear transform with pre-warped edge
// frequencies. Sections are realised in transposed direct form II and
// evaluated in float64 whatever the sample type.
package signal
