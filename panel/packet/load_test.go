package packet_test

import (
	"net/url"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"
)

// TestPageLoadTime opens a built review page in Chromium and reports how long
// it takes until the first item is drawn and how long moving on to the next
// item takes. A diagnostic, not a timed test: it is skipped unless
// QUORATE_PAGE_LOAD names a review.html, e.g.
//
//	QUORATE_PAGE_LOAD=/tmp/st/packets/amara/review.html go test -run TestPageLoadTime -v ./panel/packet/
func TestPageLoadTime(t *testing.T) {
	page := os.Getenv("QUORATE_PAGE_LOAD")
	if page == "" {
		t.Skip("QUORATE_PAGE_LOAD not set")
	}
	page, err := filepath.Abs(page)
	if err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(page)
	if err != nil {
		t.Fatal(err)
	}
	ctx := newBrowser(t, 3*time.Minute)
	// Start the browser before the clock.
	if err := chromedp.Do(ctx, chromedp.Navigate("about:blank")); err != nil {
		t.Fatal(err)
	}
	t0 := time.Now()
	if err := chromedp.Do(ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: page}).String()), pageReady); err != nil {
		t.Fatal(err)
	}
	load := time.Since(t0)
	var steps []time.Duration
	for range 5 {
		t1 := time.Now()
		if err := chromedp.Do(ctx, chromedp.KeyEvent(kb.PageDown)); err != nil {
			t.Fatal(err)
		}
		if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool]("window.quorate.settled()", chromedp.EvalAwaitPromise)); err != nil {
			t.Fatal(err)
		}
		steps = append(steps, time.Since(t1))
	}
	heap, err := chromedp.Run(ctx, chromedp.Evaluate[float64]("performance.memory ? performance.memory.usedJSHeapSize : 0"))
	if err != nil {
		t.Fatal(err)
	}
	// Navigation Timing Level 2 (W3C): when the document was parsed.
	parsed, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`performance.getEntriesByType("navigation")[0].domContentLoadedEventEnd`))
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%s: %.1f MB; parsed after %.0f ms, first item drawn after %v; next item: %v; JS heap %.0f MB",
		page, float64(st.Size())/1e6, parsed, load.Round(time.Millisecond), steps, heap/1e6)
}
