package export

// Column documents one column of one exported table.
type Column struct {
	Name        string            `json:"name"`
	Type        string            `json:"type"` // string, boolean, int32, int64, float32, float64, date, list<…>
	Nullable    bool              `json:"nullable"`
	Unit        string            `json:"unit,omitempty"`
	Description string            `json:"description"`
	Levels      map[string]string `json:"levels,omitempty"`
}

// Table documents one exported table.
type Table struct {
	Name        string   `json:"name"`
	File        string   `json:"file"`
	Description string   `json:"description"`
	Columns     []Column `json:"columns"`
}

// doc is the hand-written part of a column's documentation; the type and nullability
// come from the row struct so that they cannot drift from what is written.
type doc struct {
	unit, desc string
	levels     map[string]string
}

var majorityLevels = map[string]string{
	"present":      "a strict majority of the raters who answered found the criterion present",
	"absent":       "a strict majority found it absent (or a tie under the study's tie policy 'absent')",
	"undetermined": "a tie under the tie policy 'undetermined'",
	"no-quorum":    "fewer answers than the study's quorum",
}

var verdictLevels = map[string]string{
	"epileptiform":     "a strict majority of the raters who answered called the event epileptiform (or a tie under the tie policy 'present')",
	"not-epileptiform": "a strict majority called it not epileptiform (or a tie under the study's tie policy 'absent')",
	"undetermined":     "a tie under the tie policy 'undetermined'",
	"no-quorum":        "fewer answers than the study's quorum",
}

func criterionName(c int) string {
	return [...]string{"spiky morphology", "duration unlike the background", "asymmetric waveform",
		"after-going slow wave", "disruption of the background", "field suggesting a cerebral dipolar source"}[c-1]
}

// eventDocs explains the events table. Criteria follow Kane et al. (2017), Clinical
// Neurophysiology Practice 2:170–185.
var eventDocs = func() map[string]doc {
	m := map[string]doc{
		"event_id":                {"", "Event identifier: a hash of recording, detector and peak sample; joins the ratings and epochs tables.", nil},
		"subject_key":             {"", "Pseudonymous subject key (keyed hash of the header's patient field); the same for all recordings of one patient.", nil},
		"recording_id":            {"", "Recording identifier (hash of the file's content); joins the recordings table.", nil},
		"onset_s":                 {"s", "Time of the event's peak (controls: start of the background epoch), seconds from the recording start.", nil},
		"kind":                    {"", "Kind of drawn unit.", map[string]string{"candidate": "a sharp transient found by the detector", "control": "a background epoch drawn away from all candidates"}},
		"stratum":                 {"", "Stratum of the stratified draw the event was drawn from.", nil},
		"inclusion_probability":   {"", "First-order inclusion probability π of the event in the draw (all phases so far).", nil},
		"design_weight":           {"", "Design weight 1/π: the number of archive events this event stands for (Horvitz & Thompson 1952).", nil},
		"phase":                   {"", "Draw phase the event entered in (1 = first draw, 2… = top-ups).", nil},
		"source":                  {"", "Detector that found the candidate: 'builtin' or 'import:NAME'.", nil},
		"region":                  {"", "Lobe and side of the peak channel, e.g. 'temporal-left'.", nil},
		"lobe":                    {"", "Lobe of the peak channel.", map[string]string{"frontal": "", "temporal": "", "central": "", "parietal": "", "occipital": ""}},
		"side":                    {"", "Side of the peak channel.", map[string]string{"left": "", "right": "", "midline": ""}},
		"peak_channel":            {"", "10-10 name of the channel with the largest deflection.", nil},
		"polarity":                {"", "Surface polarity of the peak in the common average reference.", map[string]string{"negative": "", "positive": ""}},
		"state":                   {"", "Vigilance state from the recording's annotations, or 'unknown'.", nil},
		"channels":                {"", "10-10 names of the channels involved in the event, empty for controls (CSV and BIDS: separated by ';').", nil},
		"amplitude_uv":            {"µV", "Peak amplitude at the peak channel, common average reference.", nil},
		"c1_duration_ms":          {"ms", "Criterion 1 (spiky morphology): duration of the spike or sharp wave.", nil},
		"c1_sharpness":            {"", "Criterion 1: spikiness, the geometric mean of the apex's pointedness and the relative size of the opposite-polarity phase after the main phase, 0 for a monophasic wave (headline feature of criterion 1).", nil},
		"c1_phases":               {"", "Criterion 1: number of phases of the transient.", nil},
		"c2_duration_log_ratio":   {"", "Criterion 2 (duration unlike the background): |ln(D / (T/2))|, D the transient's main-phase duration and T/2 the half-period of the background's dominant rhythm (Welch spectrum of the 16 s either side, within the event's vigilance state when the recording's annotations give it); where the anchored phase is a ripple on a larger wave, the larger wave's duration; 0 = a background wave's duration (headline feature of criterion 2).", nil},
		"c2_background_period_ms": {"ms", "Criterion 2: half-period of the surrounding background's dominant rhythm, the duration D is compared with.", nil},
		"c3_asymmetry":            {"", "Criterion 3 (asymmetry): ratio of the two flanks' transition durations between 20 % and 80 % of the apex's height above the local baseline (IEEE Std 181), read between samples on the band-limited trace, folded so that either direction counts, ≥ 1; 1 = symmetric. Read on the event's virtual channel, the spatial filter over all channels that passes the event's voltage map and lets through the least background (headline feature of criterion 3).", nil},
		"c3_rise_ms":              {"ms", "Criterion 3: time from the main phase's first base to its peak, on the channel c3 is read on.", nil},
		"c3_fall_ms":              {"ms", "Criterion 3: time from the peak to the main phase's second base, on the channel c3 is read on.", nil},
		"c4_slow_wave_ratio":      {"", "Criterion 4 (after-going slow wave): mean of the 400 ms after the main phase, of the event's polarity, above both the 200 ms before it and the main phase's end, in background standard deviations of the same statistic (headline feature of criterion 4).", nil},
		"c5_disruption":           {"", "Criterion 5 (background disruption): −½ ln of the mean square first difference 0.3–1.0 s after the peak over that of the surrounding background, each less the channel's floor (the quietest half-second within 16 s); positive = attenuation, negative = new fast activity (headline feature of criterion 5).", nil},
		"c6_dipole_gof":           {"", "Criterion 6 (cerebral field): goodness of fit of a single equivalent dipole to the event's voltage map (each channel regressed on the peak channel over the main phase), 0…1 (headline feature of criterion 6).", nil},
		"c6_dipole_x":             {"", "Criterion 6: fitted dipole position, x (towards the right ear), as a fraction of the scalp radius of the spherical head model.", nil},
		"c6_dipole_y":             {"", "Criterion 6: fitted dipole position, y (towards the nose), as a fraction of the scalp radius.", nil},
		"c6_dipole_z":             {"", "Criterion 6: fitted dipole position, z (towards the vertex), as a fraction of the scalp radius.", nil},
		"c6_orientation":          {"", "Criterion 6: orientation of the fitted dipole.", map[string]string{"radial": "", "tangential": "", "oblique": ""}},
		"c6_field_extent":         {"", "Criterion 6: electrodes of the peak's polarity at ≥ 50 % of its magnitude in the common-average map at the peak.", nil},
		"auto_count":              {"", "Number of criteria the detector found met (0–6).", nil},
		"score":                   {"", "The built-in detector's ranking score.", nil},
		"import_score":            {"", "An imported detector's score; null for built-in candidates.", nil},
		"raters":                  {"", "Number of raters who answered any question on the event (hidden duplicates not counted).", nil},
		"criteria_present":        {"", "Number of criteria whose panel majority is 'present' (0–6).", nil},
		"epileptiform_votes":      {"", "Raters who called the event epileptiform (an IED).", nil},
		"not_epileptiform_votes":  {"", "Raters who called the event not epileptiform.", nil},
		"verdict":                 {"", "Panel majority on 'epileptiform?', in the words of the returns (cannot-judge answers count toward neither side nor the quorum).", verdictLevels},
		"ds_probability":          {"", "Dawid–Skene posterior probability that the event is an IED (Dawid & Skene 1979, Applied Statistics 28:20–28); null when the model was not fitted.", nil},
		"ref_panel":               {"", "Reference label from the panel: verdict 'epileptiform' → true, 'not-epileptiform' → false, otherwise null.", nil},
		"ref_dawid_skene":         {"", "Reference label from the Dawid–Skene model: ds_probability ≥ 0.5; null when not fitted.", nil},
		"ref_external":            {"", "Reference label from an external standard (e.g. the patient's later diagnosis), when given; otherwise null.", nil},
		"op_decision":             {"", "Decision of the tuned operating point (see the dictionary's header for its rule); null when no operating point was given.", nil},
	}
	for c := 1; c <= 6; c++ {
		n := string(rune('0' + c))
		cn := criterionName(c)
		m["c"+n+"_met"] = doc{"", "Criterion " + n + " (" + cn + ") met by the detector at its cutoff.", nil}
		m["c"+n+"_present_votes"] = doc{"", "Raters who found criterion " + n + " (" + cn + ") present.", nil}
		m["c"+n+"_absent_votes"] = doc{"", "Raters who found criterion " + n + " (" + cn + ") absent.", nil}
		m["c"+n+"_majority"] = doc{"", "Panel majority on criterion " + n + " (" + cn + ").", majorityLevels}
	}
	return m
}()

var ratingDocs = func() map[string]doc {
	m := map[string]doc{
		"event_id":     {"", "Event rated; joins the events table.", nil},
		"rater":        {"", "Rater code as registered in the study.", nil},
		"packet":       {"", "Rating packet the item was shown in.", nil},
		"item_code":    {"", "Blinded item code shown to the rater.", nil},
		"epileptiform": {"", "The rater's answer to 'epileptiform (IED)?'; null when left blank.", nil},
		"confidence":   {"", "The rater's confidence, 1 (guess) to 5 (certain); null when not given.", nil},
		"duplicate":    {"", "True for the second showing of a hidden duplicate (used for intra-rater agreement, left out of the consensus).", nil},
		"comment":      {"", "The rater's free-text comment; null unless comments were exported on request.", nil},
	}
	for c := 1; c <= 6; c++ {
		n := string(rune('0' + c))
		m["c"+n] = doc{"", "The rater's answer on criterion " + n + " (" + criterionName(c) + "): true present, false absent, null blank.", nil}
	}
	return m
}()

var recordingDocs = map[string]doc{
	"recording_id":        {"", "Recording identifier (hash of the file's content).", nil},
	"subject_key":         {"", "Pseudonymous subject key.", nil},
	"format":              {"", "File format.", map[string]string{"EDF": "", "EDF+C": "", "EDF+D": "", "BDF": "", "BDF+C": "", "BDF+D": ""}},
	"start_date":          {"", "Start date shifted by the subject's offset (whole days); null when dates were not shifted.", nil},
	"start_year":          {"", "Calendar year of the start, unshifted; null when dates were shifted (the year would reveal part of the offset).", nil},
	"start_time_of_day_s": {"s", "Start time of day, seconds after midnight of the header's clock (unchanged by whole-day shifts).", nil},
	"date_shifted":        {"", "True when start_date is shifted.", nil},
	"duration_s":          {"s", "Recording duration (data records × record duration).", nil},
	"record_count":        {"", "Number of data records.", nil},
	"record_duration_s":   {"s", "Duration of one data record.", nil},
	"eeg_channel_count":   {"", "Number of scalp EEG channels.", nil},
	"eeg_channels":        {"", "10-10 names of the scalp EEG channels in file order (CSV: separated by ';').", nil},
	"sample_rates_hz":     {"Hz", "Distinct sample rates of the EEG channels (CSV: separated by ';').", nil},
	"annotation_count":    {"", "Number of annotations in the file (time-keeping annotations excluded).", nil},
	"discontinuities":     {"", "Number of gaps between EDF+D/BDF+D segments.", nil},
}

var epochDocs = map[string]doc{
	"event_id":       {"", "Event; joins the events table.", nil},
	"recording_id":   {"", "Recording the samples were read from.", nil},
	"channel":        {"", "Derivation name: 'Fp1-Ref' (referential), 'Fp1-Avg' (common average) or 'Fp1-F7' (bipolar).", nil},
	"channel_index":  {"", "0-based position of the channel in the event's montage; rows of one event share the montage order.", nil},
	"montage":        {"", "Montage the samples are in.", map[string]string{"common-average": "each electrode minus the mean of all scalp EEG electrodes (Offner 1950)", "referential": "as recorded", "longitudinal-bipolar": "front-to-back chains (ACNS Guideline 3, Acharya et al. 2016)", "transverse-bipolar": "left-to-right chains (ACNS Guideline 3)"}},
	"sample_rate_hz": {"Hz", "Sample rate of the channel.", nil},
	"window_onset_s": {"s", "Time of the first sample of the window, seconds from the recording start (may be negative when padded).", nil},
	"event_offset_s": {"s", "Time of the event within the window: onset_s − window_onset_s.", nil},
	"pad_before":     {"", "Samples of NaN padding at the start: the window began before the recording.", nil},
	"pad_after":      {"", "Samples of NaN padding at the end: the window ran past the recording's end.", nil},
	"padded":         {"", "True when pad_before or pad_after is positive.", nil},
	"samples":        {"µV", "The window's samples, float32, converted to µV from the file's V, mV or nV (other dimensions taken as µV), NaN where padded.", nil},
}

// BIDS tables. onset and duration are the specification's required first columns
// (BIDS specification, "Task events"; Pernet et al. 2019).
var bidsEventExtra = map[string]doc{
	"onset":      {"s", "Onset of the event: its peak (controls: the start of the background epoch), seconds from the beginning of the recording.", nil},
	"duration":   {"s", "Duration of the event: 0, an impulse at the peak (controls: the background epoch length when known, else n/a).", nil},
	"trial_type": {"", "Kind of drawn unit.", eventDocs["kind"].levels},
}

var bidsChannelDocs = map[string]doc{
	"name":               {"", "Channel label as in the recording, normalised to 10-10 names for scalp EEG.", nil},
	"type":               {"", "Channel type (BIDS EEG channel types).", map[string]string{"EEG": "scalp EEG", "ECG": "electrocardiogram", "EOG": "electro-oculogram", "EMG": "electromyogram", "TRIG": "photic stimulation marker", "MISC": "anything else"}},
	"units":              {"", "Physical unit of the channel as recorded (n/a when unknown).", nil},
	"sampling_frequency": {"Hz", "Sample rate of the channel.", nil},
	"status":             {"", "Channel status where known: good or bad; n/a when not assessed.", nil},
}

var bidsParticipantDocs = map[string]doc{
	"participant_id": {"", "BIDS participant label: 'sub-' followed by the subject key's hexadecimal digits.", nil},
	"subject_key":    {"", "Pseudonymous subject key as in the Parquet and CSV exports.", nil},
}
