package packet_test

import (
	"context"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"slices"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/chromedp"

	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

const chromiumPath = "/usr/bin/chromium"

// TestReviewPageInBrowser opens a packet from disk in Chromium, rates items
// with keys and mouse, reloads to prove autosave, saves, and hands the saved
// file to returns.Parse. The page's gzip decoding is the browser's own
// (DecompressionStream, Compression Streams standard), so comparing the
// decoded traces with the input checks the encoding against an outside
// implementation.
func TestReviewPageInBrowser(t *testing.T) {
	if _, err := os.Stat(chromiumPath); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("chromium not installed at %s (apt-get install -y chromium)", chromiumPath)
		}
		t.Skipf("chromium not installed at %s; skipping the browser test", chromiumPath)
	}
	dir := t.TempDir()
	items := packet.SynthItems(6, 10, 128, 21)
	opt := packet.Options{StudyID: "STUDY-B", Secret: []byte("browser-test-secret-0123"), Raters: []string{"alice"}, Seed: 9, OutDir: filepath.Join(dir, "packets")}
	res, err := packet.Build(items, opt)
	if err != nil {
		t.Fatal(err)
	}
	entry := res.Manifest.Packets[0]
	downloads := t.TempDir()

	parent, stop := context.WithTimeout(context.Background(), 120*time.Second)
	defer stop()
	actx, cancelA := chromedp.NewExecAllocator(parent,
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU, chromedp.NoFirstRun, chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1400, 900),
	)
	defer cancelA()
	ctx, cancel := chromedp.NewContext(actx)
	defer cancel()

	pageURL := (&url.URL{Scheme: "file", Path: res.Packets[0].Page}).String()
	ready := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := chromedp.Evaluate[bool]("window.quorate.ready", chromedp.EvalAwaitPromise)(ctx, tg)
		return err
	})
	key := func(k string, mods ...chromedp.Modifier) chromedp.Action[chromedp.Void] {
		if len(mods) > 0 {
			return chromedp.KeyEvent(k, chromedp.KeyModifiers(mods...))
		}
		return chromedp.KeyEvent(k)
	}
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	eval := func(js string) any {
		t.Helper()
		v, err := chromedp.Run(ctx, chromedp.Evaluate[any](js))
		must(err)
		return v
	}

	must(chromedp.Do(ctx, chromedp.Navigate(pageURL), ready))

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
	if len(got) != len(items[first].Samples) {
		t.Fatalf("page decoded %d channels, want %d", len(got), len(items[first].Samples))
	}
	for c, ch := range items[first].Samples {
		for j, v := range ch {
			if d := math.Abs(got[c][j] - float64(v)); d > tol {
				t.Fatalf("channel %d sample %d: page %g, input %g", c, j, got[c][j], v)
			}
		}
	}

	// Item 1 by keyboard: c1–c6 present, then c3 back to absent; verdict e; confidence 4.
	must(chromedp.Do(ctx, key("1"), key("2"), key("3"), key("4"), key("5"), key("6"), key("3"), key("e"), key("4", chromedp.ModifierShift)))
	// Display controls.
	must(chromedp.Do(ctx, key("m"), key("+"), key("]")))
	if st := eval("window.quorate.state()").(map[string]any); st["montage"] != 1.0 || st["sens"] != 5.0 || st["tb"] != 40.0 {
		t.Errorf("after m + ]: montage %v sens %v tb %v, want 1, 5, 40", st["montage"], st["sens"], st["tb"])
	}
	must(chromedp.Do(ctx, key("?")))
	if eval("document.getElementById('help').open") != true {
		t.Error("? did not open the help panel")
	}
	must(chromedp.Do(ctx, key(kbEscape)))
	if eval("document.getElementById('help').open") != false {
		t.Error("Escape did not close the help panel")
	}
	// Item 2 by mouse, with a comment typed in.
	must(chromedp.Do(ctx, key("j")))
	var clicks []chromedp.Action[chromedp.Void]
	for c := 1; c <= 6; c++ {
		clicks = append(clicks, chromedp.Click(chromedp.CSS(`input[name="c`+string(rune('0'+c))+`"][value="absent"]`)))
	}
	clicks = append(clicks,
		chromedp.Click(chromedp.CSS(`input[name="verdict"][value="not-epileptiform"]`)),
		chromedp.Click(chromedp.CSS("#comment")),
		chromedp.KeyEvent(`eye "blink", 2s`),
		key(kbEscape),
	)
	must(chromedp.Do(ctx, clicks...))
	progress := func() string {
		t.Helper()
		s, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS("#progress")))
		must(err)
		return s
	}
	want := "2 / " + itoa(len(entry.Items)) + " rated"
	if p := progress(); p != want {
		t.Fatalf("progress %q, want %q", p, want)
	}

	// A reload loses nothing.
	must(chromedp.Do(ctx, chromedp.Reload(), ready))
	if p := progress(); p != want {
		t.Fatalf("after reload progress %q, want %q", p, want)
	}
	if code, _ := eval("document.getElementById('item-code').textContent").(string); code != entry.Items[1] {
		t.Errorf("after reload showing %q, want the item rated last, %q", code, entry.Items[1])
	}

	// Save downloads <packet id>.json.
	_, err = chromedp.CallBrowser(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: downloads,
	})
	must(err)
	must(chromedp.Do(ctx, key("s")))
	path := filepath.Join(downloads, entry.Packet+".json")
	var data []byte
	for deadline := time.Now().Add(20 * time.Second); time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
		if data, err = os.ReadFile(path); err == nil && len(data) > 0 {
			break
		}
	}
	if len(data) == 0 {
		names, _ := os.ReadDir(downloads)
		t.Fatalf("no %s downloaded (folder holds %v)", path, names)
	}
	ret, err := returns.Parse(filepath.Base(path), data, &res.Manifest)
	if err != nil {
		t.Fatalf("saved file refused: %v\n%s", err, data)
	}
	if len(ret.Answers) != 2 || len(ret.Unrated) != len(entry.Items)-2 {
		t.Fatalf("%d answers, %d unrated", len(ret.Answers), len(ret.Unrated))
	}
	a, b := ret.Answers[0], ret.Answers[1]
	P, A := returns.Present, returns.Absent
	if a.Item != entry.Items[0] || a.Criteria != [6]returns.Presence{P, P, A, P, P, P} || a.Verdict != returns.Epileptiform || a.Confidence != 4 {
		t.Errorf("keyboard answer %+v", a)
	}
	if b.Item != entry.Items[1] || b.Criteria != [6]returns.Presence{A, A, A, A, A, A} || b.Verdict != returns.NotEpileptiform || b.Confidence != 0 || b.Comment != `eye "blink", 2s` {
		t.Errorf("mouse answer %+v", b)
	}
	if slices.Contains(ret.Unrated, a.Item) {
		t.Error("rated item listed as unrated")
	}
}

const kbEscape = "\u001b"

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

func itoa(n int) string {
	if n < 10 {
		return string(rune('0' + n))
	}
	return itoa(n/10) + string(rune('0'+n%10))
}
