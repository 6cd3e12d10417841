package packet_test

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

// Test excerpt: 16 s at 256 Hz, 10 s rated with 3 s of context either side,
// and on Fz (referential row 4) a triangular spike of known width and height
// one second after the event, on an otherwise flat trace.
const (
	bRate       = 256.0
	bSeconds    = 16
	spikeRow    = 4 // Fz in Electrodes1020
	spikeAt     = 9.0
	spikeN      = 12 // samples from onset to end: 46.875 ms at 256 Hz
	spikeHeight = -200.0
)

func browserItems() []packet.Item {
	items := packet.SynthItems(22, bSeconds, bRate, 21)
	j0 := int(spikeAt * bRate)
	for i := range items {
		items[i].RatedFrom, items[i].RatedTo = 3, 13
		items[i].Conditioning = "synthetic, as generated"
		x := make([]float32, len(items[i].Samples[spikeRow]))
		for k := 0; k <= spikeN; k++ {
			x[j0+k] = float32(spikeHeight * (1 - math.Abs(float64(2*k-spikeN))/spikeN))
		}
		items[i].Samples[spikeRow] = x
	}
	return items
}

// TestReviewPageInBrowser opens a packet from disk in Chromium and drives it
// as a rater would: 20 items rated with the keyboard alone (one press per
// criterion at most), a caliper drag across a spike of known width, the
// filters switched, a save, and the layout checked at common screen sizes.
// The page's gzip decoding is the browser's own (DecompressionStream,
// Compression Streams standard), so comparing the decoded traces with the
// input checks the encoding against an outside implementation.
func TestReviewPageInBrowser(t *testing.T) {
	if _, err := os.Stat(chromiumPath); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("chromium not installed at %s (apt-get install -y chromium)", chromiumPath)
		}
		t.Skipf("chromium not installed at %s; skipping the browser test", chromiumPath)
	}
	dir := t.TempDir()
	items := browserItems()
	opt := packet.Options{StudyID: "STUDY-B", Secret: []byte("browser-test-secret-0123"), Raters: []string{"alice"}, Seed: 9, OutDir: filepath.Join(dir, "packets")}
	res, err := packet.Build(context.Background(), items, opt)
	if err != nil {
		t.Fatal(err)
	}
	entry := res.Manifest.Packets[0]
	downloads := t.TempDir()

	ctx := newBrowser(t, 60*time.Second)

	pageURL := (&url.URL{Scheme: "file", Path: res.Packets[0].Page}).String()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	eval := func(js string) any {
		t.Helper()
		v, err := chromedp.Run(ctx, chromedp.Evaluate[any](js, chromedp.EvalAwaitPromise))
		must(err)
		return v
	}
	keys := func(ks ...string) {
		t.Helper()
		var acts []chromedp.Action[chromedp.Void]
		for _, k := range ks {
			if strings.HasPrefix(k, "S-") {
				acts = append(acts, chromedp.KeyEvent(k[2:], chromedp.KeyModifiers(chromedp.ModifierShift)))
			} else {
				acts = append(acts, chromedp.KeyEvent(k))
			}
		}
		must(chromedp.Do(ctx, acts...))
		eval("window.quorate.settled()")
	}

	must(chromedp.Do(ctx, chromedp.EmulateViewport(1280, 720), chromedp.Navigate(pageURL), pageReady))

	// Decoded traces of the first item equal the input to within half a step.
	first := eventIndex(t, res, items, entry.Items[0])
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[][]float64]("window.quorate.decode(0)", chromedp.EvalAwaitPromise))
	must(err)
	var peak float64
	for _, ch := range items[first].Samples {
		for _, v := range ch {
			peak = max(peak, math.Abs(float64(v)))
		}
	}
	tol := max(packet.DefaultResolution, peak/32767)/2 + 1e-4
	for c, ch := range items[first].Samples {
		for j, v := range ch {
			if d := math.Abs(got[c][j] - float64(v)); d > tol {
				t.Fatalf("channel %d sample %d: page %g, input %g", c, j, got[c][j], v)
			}
		}
	}

	// The page opens with the packet's filters and says so.
	if s := eval("document.getElementById('signal-note').textContent").(string); !strings.Contains(s, "LFF 0.5 Hz · HFF 70 Hz · notch 50 Hz") || !strings.Contains(s, "256 samples/s") {
		t.Errorf("signal note %q does not state the filters and rate in force", s)
	}

	// Filters, checked on sines against filter theory: a second-order
	// Butterworth passes its cut-off at 1/√2, and run forward and backward at
	// 1/2 (−6 dB); far inside the pass band the gain is 1; a notch of Q 30
	// removes its centre frequency (Oppenheim & Schafer 2010, §7; section
	// number from memory). The same five gains from scipy.signal.butter,
	// iirnotch and sosfiltfilt: 0.9999, 0.5000, 0.5000, 0.0000, 0.0000
	// (testdata/filter_gains.py).
	gain := func(f, lff, hff, notch float64) float64 {
		t.Helper()
		js := fmt.Sprintf(`(() => { const n = 4096, x = []; for (let j = 0; j < n; j++) x.push(Math.sin(2*Math.PI*%g*j/256));
			const y = window.quorate.filter(x, 256, %g, %g, %g); let a = 0; for (let j = 1024; j < 3072; j++) a = Math.max(a, Math.abs(y[j])); return a; })()`, f, lff, hff, notch)
		return eval(js).(float64)
	}
	for _, c := range []struct{ f, lff, hff, notch, want, tol float64 }{
		{10, 0.5, 70, 50, 1, 0.02},
		{70, 0, 70, 0, 0.5, 0.02},
		{0.5, 0.5, 0, 0, 0.5, 0.03},
		{50, 0, 0, 50, 0, 0.05},
		{60, 0, 0, 60, 0, 0.05},
	} {
		if g := gain(c.f, c.lff, c.hff, c.notch); math.Abs(g-c.want) > c.tol {
			t.Errorf("%g Hz through LFF %g, HFF %g, notch %g: gain %.3f, want %.2f", c.f, c.lff, c.hff, c.notch, g, c.want)
		}
	}

	// Layout: the whole form is on screen without scrolling.
	shots := t.TempDir()
	if os.Getenv("QUORATE_SCREENSHOTS") != "" {
		shots = "testdata"
	}
	layout := func(w, h int64) {
		t.Helper()
		must(chromedp.Do(ctx, chromedp.EmulateViewport(w, h)))
		time.Sleep(250 * time.Millisecond) // the page redraws 120 ms after a resize
		r := eval(`(() => { const out = {}; for (const s of ["#criteria-set", ".verdict", ".confidence", "#comment", "#item-state", "#btn-save", "#traces", ".legend"]) {
			const b = document.querySelector(s).getBoundingClientRect(); out[s] = [b.left, b.top, b.right, b.bottom]; }
			out.scroll = [document.documentElement.scrollWidth, document.documentElement.scrollHeight]; return out; })()`).(map[string]any)
		for s, v := range r {
			b := v.([]any)
			if s == "scroll" {
				if b[0].(float64) > float64(w) || b[1].(float64) > float64(h) {
					t.Errorf("%d×%d: page scrolls (%v×%v)", w, h, b[0], b[1])
				}
				continue
			}
			if b[0].(float64) < 0 || b[1].(float64) < 0 || b[2].(float64) > float64(w) || b[3].(float64) > float64(h) || b[3].(float64) <= b[1].(float64) {
				t.Errorf("%d×%d: %s at %v, not wholly on screen", w, h, s, b)
			}
		}
		png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
		must(err)
		must(os.WriteFile(filepath.Join(shots, fmt.Sprintf("review-%dx%d.png", w, h)), png, 0o644))
	}

	// Seconds from the event label the grid, and no two labels on the
	// traces overlap (their drawn boxes, from the canvas's text metrics).
	secLabel := regexp.MustCompile(`^(0|[+\x{2212}]\d+(\.\d)?) s$`)
	labelsApart := func(where string) {
		t.Helper()
		type text struct {
			Text string     `json:"text"`
			Box  [4]float64 `json:"box"`
		}
		var ts []text
		must(json.Unmarshal([]byte(eval("JSON.stringify(window.quorate.texts())").(string)), &ts))
		secs, scale := 0, 0
		for i, a := range ts {
			if secLabel.MatchString(a.Text) {
				secs++
			}
			if a.Text == "50 µV" || strings.HasSuffix(a.Text, " s") && !secLabel.MatchString(a.Text) || strings.HasSuffix(a.Text, " ms") {
				scale++
			}
			for _, b := range ts[i+1:] {
				if a.Box[0] < b.Box[2] && b.Box[0] < a.Box[2] && a.Box[1] < b.Box[3] && b.Box[1] < a.Box[3] {
					t.Errorf("%s: labels %q %v and %q %v overlap", where, a.Text, a.Box, b.Text, b.Box)
				}
			}
		}
		if secs < 2 || scale < 2 {
			t.Errorf("%s: %d seconds labels and %d scale labels among %d texts, want ≥ 2 of each", where, secs, scale, len(ts))
		}
	}
	labelsApart("at the packet's time base")

	// 20 items with the keyboard alone. Digits 1–6 set a criterion present
	// (a second press absent, a third cannot judge); a marks the rest absent;
	// e, n, x give the verdict; c then a digit the confidence; j or Page Down
	// moves on. From item 16 on, auto-advance moves on after the verdict.
	P, A, C := "present", "absent", "cannot-judge"
	want := map[string][7]string{}
	wantConf := map[string]any{}
	for i := range 20 {
		code := eval("document.getElementById('item-code').textContent").(string)
		if code != entry.Items[i] {
			t.Fatalf("item %d: showing %s, want %s (index %v)", i+1, code, entry.Items[i], eval("window.quorate.state().index"))
		}
		w := [7]string{A, A, A, A, A, A, "not-epileptiform"}
		switch i % 4 {
		case 0: // a typical discharge: four criteria present
			keys("1", "2", "4", "6", "a", "c", "4", "e")
			w = [7]string{P, P, A, P, A, P, "epileptiform"}
			wantConf[entry.Items[i]] = 4.0
		case 1: // nothing there
			keys("a", "n")
		case 2: // obscured: c5 cannot be judged, nor the whole
			keys("5", "5", "5", "a", "x")
			w = [7]string{A, A, A, A, C, A, C}
		case 3: // changed mind: c3 present, then absent with a second press; c5 by Shift+5
			keys("3", "3", "1", "S-5", "a", "c", "2", "e") // Shift+5 reads as 5 (AZERTY prints digits with Shift)
			w = [7]string{P, A, A, A, P, A, "epileptiform"}
			wantConf[entry.Items[i]] = 2.0
		}
		want[entry.Items[i]] = w
		if i == 0 {
			layout(1280, 720)
		}
		switch {
		case i == 14:
			must(chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#auto")), chromedp.Blur(chromedp.CSS("#auto"))))
			keys(kb.PageDown)
		case i >= 15:
			// auto-advance
		case i%2 == 0:
			keys("j")
		default:
			keys(kb.PageDown)
		}
	}
	if p := eval("document.getElementById('progress').textContent").(string); !strings.HasPrefix(p, "20 of 24 items complete (22 events; 2 shown twice)") {
		t.Errorf("progress %q", p)
	}

	// Caliper on item 21: filters off (f), then a drag from the spike's
	// onset to its end, and one from the baseline to its peak.
	keys("f")
	if st := eval("window.quorate.state()").(map[string]any); st["lff"] != 0.0 || st["hff"] != 0.0 || st["notch"] != 0.0 {
		t.Fatalf("after f: filters %v %v %v, want all off", st["lff"], st["hff"], st["notch"])
	}
	if s := eval("document.getElementById('signal-note').textContent").(string); !strings.Contains(s, "LFF off · HFF off · notch off") {
		t.Errorf("signal note after f: %q", s)
	}
	if eval("window.quorate.state().montage") != 0.0 {
		t.Fatal("not on the referential montage")
	}
	at := func(tm float64) (float64, float64) {
		t.Helper()
		p := eval(fmt.Sprintf("window.quorate.at(%g, %d)", tm, spikeRow)).(map[string]any)
		return p["x"].(float64), p["y"].(float64)
	}
	drag := func(t0, t1 float64) map[string]any {
		t.Helper()
		x0, y0 := at(t0)
		x1, _ := at(t1)
		must(chromedp.Do(ctx,
			chromedp.MouseEvent(chromedp.MousePressed, x0, y0, chromedp.ButtonLeft, chromedp.ClickCount(1)),
			chromedp.MouseEvent(chromedp.MouseMoved, (x0+x1)/2, y0, chromedp.ButtonLeft),
			chromedp.MouseEvent(chromedp.MouseMoved, x1, y0, chromedp.ButtonLeft),
			chromedp.MouseEvent(chromedp.MouseReleased, x1, y0, chromedp.ButtonLeft, chromedp.ClickCount(1)),
		))
		c, _ := eval("window.quorate.caliper()").(map[string]any)
		if c == nil {
			t.Fatalf("no caliper reading after a drag from %.1f,%.1f to %.1f (tb %v, canvas %v)", x0, y0, x1, eval("window.quorate.state().tb"), eval("JSON.stringify(document.getElementById('traces').getBoundingClientRect())"))
		}
		return c
	}
	// A rater measures at a fast time base: 120 mm/s puts 1.8 px between
	// samples at 256 Hz; → scrolls the spike, 1 s after the event, into view.
	keys(".", ".", ".", ".", ".", ".", ".", kb.ArrowRight)
	// The time base is true to CSS millimetres (96 px per inch, CSS Values 4).
	xa, _ := at(spikeAt)
	xb, _ := at(spikeAt + 1)
	if tb := eval("window.quorate.state().tb").(float64); math.Abs((xb-xa)-tb*96/25.4) > 0.01 {
		t.Errorf("1 s spans %.2f px at %g mm/s, want %.2f", xb-xa, tb, tb*96/25.4)
	}
	labelsApart("at 120 mm/s")
	width := spikeN / bRate * 1000
	c := drag(spikeAt, spikeAt+spikeN/bRate)
	if ms := c["ms"].(float64); math.Abs(ms-width) > 1000/bRate {
		t.Errorf("caliper reads %.2f ms across the spike, want %.3f ms within one sample (%.2f ms)", ms, width, 1000/bRate)
	}
	c = drag(spikeAt, spikeAt+spikeN/2/bRate)
	if uv := c["uv"].(float64); math.Abs(uv-spikeHeight) > packet.DefaultResolution {
		t.Errorf("caliper reads %.2f µV from baseline to peak, want %g", uv, spikeHeight)
	}
	layout(1366, 768)
	if s := eval("document.getElementById('caliper').textContent").(string); !strings.Contains(s, "Fz") || !strings.Contains(s, "ms") || !strings.Contains(s, "µV") {
		t.Errorf("caliper readout %q", s)
	}
	// Filters back on with f, then the low-frequency filter by its control.
	keys("f")
	must(chromedp.Do(ctx, chromedp.SetValue(chromedp.CSS("#lff"), "1"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("lff").dispatchEvent(new Event("change", {bubbles: true}))`)))
	if st := eval("window.quorate.state()").(map[string]any); st["lff"] != 1.0 || st["hff"] != 70.0 || st["notch"] != 50.0 {
		t.Errorf("filters %v %v %v, want 1, 70, 50", st["lff"], st["hff"], st["notch"])
	}
	// Scrolling into the context and back.
	t0 := eval("window.quorate.at(0, 0).x").(float64)
	keys(kb.ArrowLeft)
	if t1 := eval("window.quorate.at(0, 0).x").(float64); t1 <= t0 {
		t.Errorf("← did not scroll back into the context (x of 0 s: %.0f then %.0f)", t0, t1)
	}

	// Item 21 left half-rated; the save names it as owed, and the message
	// does not follow the rater to the next item.
	keys("1")
	_, err = chromedp.CallBrowser(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: downloads,
	})
	must(err)
	keys("s")
	half := entry.Items[20]
	if s := eval("document.getElementById('status').textContent").(string); !strings.Contains(s, "20 complete items will be merged") || !strings.Contains(s, "still owed") || !strings.Contains(s, half) {
		t.Errorf("save message %q", s)
	}
	keys("j")
	if s := eval("document.getElementById('status').textContent").(string); s != "" {
		t.Errorf("save message lingers on the next item: %q", s)
	}
	// Keyboard layouts. AltGr types characters, not commands: AltGr+5 is "["
	// on AZERTY, as Ctrl+Alt (Windows) or AltGraph (X11); neither may set
	// criterion 5. On a Cyrillic layout j prints "о" and still moves on (the
	// key's position, KeyboardEvent.code, UI Events KeyboardEvent code values).
	idx := eval("window.quorate.state().index").(float64)
	before := eval("JSON.stringify(window.quorate.state().answers)").(string)
	for _, init := range []string{`{key: "[", code: "Digit5", ctrlKey: true, altKey: true}`, `{key: "[", code: "Digit5", modifierAltGraph: true}`} {
		eval(`document.dispatchEvent(new KeyboardEvent("keydown", Object.assign(` + init + `, {bubbles: true})))`)
		eval("window.quorate.settled()")
		if after := eval("JSON.stringify(window.quorate.state().answers)").(string); after != before {
			t.Errorf("AltGr key %s changed the answers", init)
		}
	}
	eval(`document.dispatchEvent(new KeyboardEvent("keydown", {key: "о", code: "KeyJ", bubbles: true}))`)
	eval("window.quorate.settled()")
	if got := eval("window.quorate.state().index").(float64); got != idx+1 {
		t.Errorf("Cyrillic j (о at KeyJ): index %v, want %v", got, idx+1)
	}
	// At 15 mm/s the time and voltage bars keep their labels apart (see
	// review-1920x1080.png).
	keys(",", ",", ",", ",", ",", ",")
	if tb := eval("window.quorate.state().tb"); tb != 15.0 {
		t.Errorf("time base %v after six presses of ',', want 15", tb)
	}
	labelsApart("at 15 mm/s, 1366×768")
	layout(1920, 1080)
	labelsApart("at 15 mm/s, 1920×1080")

	path := filepath.Join(downloads, entry.Packet+".json")
	var data []byte
	for deadline := time.Now().Add(10 * time.Second); time.Now().Before(deadline); time.Sleep(50 * time.Millisecond) {
		if data, err = os.ReadFile(path); err == nil && len(data) > 0 {
			break
		}
	}
	if len(data) == 0 {
		t.Fatalf("no %s downloaded", path)
	}
	var ret struct {
		Answers []map[string]any `json:"answers"`
	}
	must(json.Unmarshal(data, &ret))
	if len(ret.Answers) != 21 {
		t.Fatalf("%d answers saved, want 20 complete and 1 half-rated", len(ret.Answers))
	}
	for _, a := range ret.Answers {
		code := a["item"].(string)
		if code == half {
			if a["c1"] != P || a["c2"] != "" || a["verdict"] != "" {
				t.Errorf("half-rated item saved as %v", a)
			}
			continue
		}
		w, ok := want[code]
		if !ok {
			t.Errorf("unexpected item %s", code)
			continue
		}
		for k := range 6 {
			if a[fmt.Sprintf("c%d", k+1)] != w[k] {
				t.Errorf("%s c%d = %v, want %s", code, k+1, a[fmt.Sprintf("c%d", k+1)], w[k])
			}
		}
		if a["confidence"] != wantConf[code] {
			t.Errorf("%s confidence = %v, want %v", code, a["confidence"], wantConf[code])
		}
		if a["verdict"] != w[6] {
			t.Errorf("%s verdict = %v, want %s", code, a["verdict"], w[6])
		}
	}

	// The returns parser takes the file the page wrote as it is: the 20
	// complete items (cannot-judge answers included) merge, and the
	// half-rated one is listed as incomplete, by its code, not refused.
	r, err := returns.Parse(filepath.Base(path), data, &res.Manifest)
	if err != nil {
		t.Fatalf("saved file refused: %v", err)
	}
	if len(r.Answers) != 20 || len(r.Incomplete) != 1 || r.Incomplete[0] != half {
		t.Errorf("parsed %d complete answers, incomplete %v; want 20 and [%s]", len(r.Answers), r.Incomplete, half)
	}
	cj := 0
	for _, a := range r.Answers {
		if a.Verdict == returns.VerdictCannotJudge {
			cj++
		}
		if a.Item == entry.Items[0] && (a.Criteria[0] != returns.Present || a.Confidence != 4) {
			t.Errorf("first item parsed as %+v", a)
		}
	}
	if cj != 5 {
		t.Errorf("%d cannot-judge verdicts parsed, want 5", cj)
	}
}

func eventIndex(t *testing.T, res *packet.Result, items []packet.Item, code string) int {
	t.Helper()
	for _, k := range res.Key {
		if k.Item == code {
			for i, it := range items {
				if it.EventID == k.EventID {
					return i
				}
			}
		}
	}
	t.Fatalf("code %s not in key", code)
	return -1
}
