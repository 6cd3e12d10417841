package packet_test

import (
	"context"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// chromiumPath is Debian's chromium, which .ci/run installs.
const chromiumPath = "/usr/bin/chromium"

// newBrowser starts a headless Chromium with a 1280×720 window and a fresh
// profile and returns its context, which ends after timeout or with the test.
func newBrowser(t *testing.T, timeout time.Duration) context.Context {
	t.Helper()
	parent, stop := context.WithTimeout(context.Background(), timeout)
	actx, cancelA := chromedp.NewExecAllocator(parent,
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU, chromedp.NoFirstRun, chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("hide-scrollbars", false),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 720),
	)
	ctx, cancel := chromedp.NewContext(actx)
	t.Cleanup(func() { cancel(); cancelA(); stop() })
	return ctx
}

// pageReady waits until the review page has drawn its first item.
var pageReady = chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
	_, err := chromedp.Evaluate[bool]("window.quorate.ready", chromedp.EvalAwaitPromise)(ctx, tg)
	return err
})
