#!/usr/bin/python3
"""Write a tiny BrainVision (vhdr/vmrk/eeg) recording whose samples follow a
closed form, for conversion to EDF by an independent implementation
(biosig-tools save2gdf). See README.md for the exact commands.

Sample n of channel c (0-based) is the int16
    d[c][n] = round(1000*sin(2*pi*f_c*n/fs)) + 100*c
with fs = 250 Hz and f_c = (1, 2, 5, 10) Hz; resolution 0.5 uV per unit,
so the physical value is 0.5*d[c][n] microvolts.
"""
import math
import struct

FS = 250
SECONDS = 4
FREQS = (1, 2, 5, 10)
LABELS = ("EEG Fp1-REF", "T3", "Cz", "ECG")
RES = 0.5

def sample(c, n):
    return int(round(1000 * math.sin(2 * math.pi * FREQS[c] * n / FS))) + 100 * c

with open("src.vhdr", "w", newline="\r\n") as f:
    f.write("Brain Vision Data Exchange Header File Version 1.0\n\n")
    f.write("[Common Infos]\nDataFile=src.eeg\nMarkerFile=src.vmrk\n")
    f.write("DataFormat=BINARY\nDataOrientation=MULTIPLEXED\n")
    f.write("NumberOfChannels=%d\nSamplingInterval=%d\n\n" % (len(LABELS), 1000000 // FS))
    f.write("[Binary Infos]\nBinaryFormat=INT_16\n\n[Channel Infos]\n")
    for i, lab in enumerate(LABELS):
        f.write("Ch%d=%s,,%g,uV\n" % (i + 1, lab, RES))

with open("src.vmrk", "w", newline="\r\n") as f:
    f.write("Brain Vision Data Exchange Marker File, Version 1.0\n\n")
    f.write("[Common Infos]\nDataFile=src.eeg\n\n[Marker Infos]\n")
    f.write("Mk1=New Segment,,1,1,0,20240305101112000000\n")

with open("src.eeg", "wb") as f:
    for n in range(FS * SECONDS):
        f.write(struct.pack("<%dh" % len(LABELS), *[sample(c, n) for c in range(len(LABELS))]))
