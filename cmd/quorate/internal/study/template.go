package study

import (
	"strings"
	"text/template"
)

// protocolTemplate is the commented study.yaml that init writes. The comments are the
// protocol's documentation: a coordinator edits this file, not a hidden default.
var protocolTemplate = template.Must(template.New(ConfigFile).Funcs(template.FuncMap{
	"quote": func(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" },
}).Parse(`# quorate study protocol.
# Every command reads this file; a command-line flag overrides a value for one run only.
# quorate is a research and quality tool, not a diagnostic device: validate any operating
# point locally; clinical decisions rest with qualified clinicians; follow local rules on
# data protection.

study:
  id: {{.ID}}            # ties packets and returns to this study; do not edit
  name: {{quote .Name}}
  centre: ''

archive:
  # Folders searched recursively for EDF, EDF+ and BDF recordings (recognised by content).
  # The archive is only ever read.
  roots:
{{- range .Roots}}
    - {{quote .}}
{{- else}} []
{{- end}}

signal:
  montage: common-average     # referential | common-average | longitudinal-bipolar | transverse-bipolar
  bandpass_hz: [0.5, 70]      # Butterworth band-pass, order 2 per edge, applied forward and backward
  notch_hz: 50                # 50 or 60 (mains frequency of the recording site); 0 for none; detection notches a recording showing only the other line there instead, with a warning

detect:
  threshold_mad: 4.5          # transient response, in robust background scales (median absolute deviation)
  background_window_s: 10     # sliding window for the background scale
  merge_window_ms: 50         # detections this close across channels form one event

# Default cutoff of each criterion's feature (sampling/detect/FEATURES.md explains each).
criteria_cutoffs:
  c1_sharpness: 0             # 0 = the documented default of the feature
  c2_duration_log_ratio: 0
  c3_asymmetry: 0
  c4_slow_wave_ratio: 0
  c5_disruption: 0
  c6_dipole_gof: 0

draw:
  n: 300                      # events for the panel
  strata: 'score:q8'          # columns; numeric ones binned by quantiles (q8) or edges, e.g. 'score:q4,lobe'
  allocation: accuracy        # accuracy | equal | proportional | neyman | table:FILE (accuracy oversamples score strata likely to hold IEDs; weights correct for it)
  min_per_stratum: 2
  subject_cap: 25             # at most this many events per subject and stratum
  controls: 30                # background epochs away from any candidate
  control_epoch_s: 1
  control_min_distance_s: 2

panel:
  raters: []                  # folder-safe names, e.g. [rater-a, rater-b, rater-c]
  duplicate_share: 0.1        # share of items shown twice, for intra-rater agreement
  window_s: 10                # seconds shown around each event
  quorum: 2                   # fewest answers for a majority decision
  tie: absent                 # a tied vote counts as: absent | present | undetermined

tuning:
  reference: panel            # panel | dawid-skene | external:PATH
  policy: min-specificity=0.95   # youden | min-specificity=X | min-sensitivity=X | max-false-per-hour=X | cost-ratio=X
  folds: 5                    # subject-grouped cross-validation
  bootstrap: 2000             # replicates, resampling subjects

seed: {{.Seed}}
`))
