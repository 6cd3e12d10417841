package export

import (
	"reflect"
	"strings"
	"time"
)

// field is one column of a row struct: its name, the struct field behind it and the
// dictionary type.
type field struct {
	name     string
	index    int
	typ      string
	nullable bool
}

// fieldsOf reads the columns of a row struct from its parquet tags, in order.
func fieldsOf(t reflect.Type) []field {
	var out []field
	for i := range t.NumField() {
		f := t.Field(i)
		tag := f.Tag.Get("parquet")
		name, opts, _ := strings.Cut(tag, ",")
		if name == "" || name == "-" {
			continue
		}
		typ, nullable := typeName(f.Type, opts)
		out = append(out, field{name: name, index: i, typ: typ, nullable: nullable})
	}
	return out
}

var timeType = reflect.TypeFor[time.Time]()

func typeName(t reflect.Type, opts string) (string, bool) {
	nullable := false
	if t.Kind() == reflect.Pointer {
		nullable = true
		t = t.Elem()
	}
	if t == timeType {
		if strings.Contains(opts, "date") {
			return "date", nullable
		}
		return "timestamp", nullable
	}
	switch t.Kind() {
	case reflect.Slice:
		e, _ := typeName(t.Elem(), "")
		return "list<" + e + ">", nullable
	case reflect.Bool:
		return "boolean", nullable
	}
	return t.Kind().String(), nullable
}

// describe joins a row struct's columns with their documentation.
func describe(name, file, desc string, row reflect.Type, docs map[string]doc) Table {
	t := Table{Name: name, File: file, Description: desc}
	for _, f := range fieldsOf(row) {
		d := docs[f.name]
		t.Columns = append(t.Columns, Column{Name: f.name, Type: f.typ, Nullable: f.nullable,
			Unit: d.unit, Description: d.desc, Levels: d.levels})
	}
	return t
}

// File names of the tables.
const (
	EventsFile     = "events"
	RatingsFile    = "ratings"
	RecordingsFile = "recordings"
	EpochsFile     = "epochs.parquet"
	DictionaryMD   = "data-dictionary.md"
	DictionaryJSON = "schema.json"
)

// Tables returns the documentation of the tables of the Parquet and CSV exports; ext
// is "parquet" or "csv". epochs adds epochs.parquet.
func Tables(ext string, epochs bool) []Table {
	ts := []Table{
		describe("events", EventsFile+"."+ext, "One row per drawn event (candidates and background controls): where it is, the detector's features and criterion decisions, the panel's votes and majorities, the reference labels, and the design of the draw.", reflect.TypeFor[EventRow](), eventDocs),
		describe("ratings", RatingsFile+"."+ext, "One row per rater × item: every answer as given (long form).", reflect.TypeFor[RatingRow](), ratingDocs),
		describe("recordings", RecordingsFile+"."+ext, "One row per indexed recording, de-identified: no file names or folders, dates shifted or reduced to the year.", reflect.TypeFor[RecordingRow](), recordingDocs),
	}
	if epochs {
		ts = append(ts, epochTable())
	}
	return ts
}

func epochTable() Table {
	return describe("epochs", EpochsFile, "Raw EEG around each drawn event, one row per event × channel, for machine learning.", reflect.TypeFor[EpochRow](), epochDocs)
}
