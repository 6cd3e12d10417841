package importer

import "testing"

// TestParseMapping checks the --map grammar recording=COL,onset=COL,channel=COL,
// score=COL[,onset-format=seconds|clock] as documented on ParseMapping.
func TestParseMapping(t *testing.T) {
	m, err := ParseMapping(" recording = File Name ,onset=Peak time,channel=Chan,score=prob, onset-format=CLOCK")
	if err != nil {
		t.Fatal(err)
	}
	want := Mapping{Recording: "File Name", Onset: "Peak time", Channel: "Chan", Score: "prob", OnsetFormat: OnsetClock}
	if m != want {
		t.Errorf("got %+v, want %+v", m, want)
	}
	if m, err := ParseMapping(""); err != nil || m != (Mapping{}) {
		t.Errorf("empty flag: %+v, %v", m, err)
	}
}

func TestParseMappingMalformed(t *testing.T) {
	for _, c := range []struct {
		spec  string
		part  string
		index int
	}{
		{"recording=file,onset", "onset", 1},
		{"recording=file,,onset=t", "", 1},
		{"recording=file,onset=", "onset=", 1},
		{"recording=file,peak=t", "peak=t", 1},
		{"onset=a,onset=b", "onset=b", 1},
		{"onset=t,onset-format=minutes", "onset-format=minutes", 1},
		{"=t", "=t", 0},
	} {
		_, err := ParseMapping(c.spec)
		if err == nil {
			t.Errorf("%q: accepted", c.spec)
			continue
		}
		me := as[*mappingError](t, err)
		if me.Part != c.part || me.Index != c.index || me.Want == "" {
			t.Errorf("%q: part %q index %d, want part %q index %d", c.spec, me.Part, me.Index, c.part, c.index)
		}
	}
}
