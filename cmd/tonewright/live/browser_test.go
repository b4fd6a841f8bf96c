package live

import (
	"context"
	"flag"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"tonewright/networks"
)

var screenshot = flag.Bool("screenshot", false, "write the README's screenshot of the live page (testdata/examples/live-page.png)")

// screenshotPath is where TestScreenshot writes, from this package's
// directory.
const screenshotPath = "../../../testdata/examples/live-page.png"

// requireBrowser returns the path of Chromium for the browser tests. It
// skips the test when Chromium is missing, saying how to install it,
// unless TONEWRIGHT_REQUIRE_BROWSER=1 (as CI sets), when it fails instead.
// TONEWRIGHT_CHROMIUM names another binary.
func requireBrowser(t testing.TB) string {
	t.Helper()
	if p := os.Getenv("TONEWRIGHT_CHROMIUM"); p != "" {
		return p
	}
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("TONEWRIGHT_REQUIRE_BROWSER") == "1" {
		t.Fatal("Chromium is required (TONEWRIGHT_REQUIRE_BROWSER=1) but not on PATH")
	}
	t.Skip("Chromium not found: install it (Debian: apt-get install chromium) to run the browser tests")
	return ""
}

// browse starts headless Chromium on url and waits for the page's first
// curve. The browser ends with the test.
func browse(t testing.TB, url string, width, height int) context.Context {
	t.Helper()
	exe := requireBrowser(t)
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(exe),
		chromedp.WindowSize(width, height),
		chromedp.Flag("hide-scrollbars", true),
		chromedp.Flag("autoplay-policy", "no-user-gesture-required"),
	)
	if os.Geteuid() == 0 {
		opts = append(opts, chromedp.NoSandbox) // Chromium refuses to run as root with its sandbox
	}
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelC := chromedp.NewContext(actx)
	ctx, cancelT := context.WithTimeout(ctx, 120*time.Second)
	t.Cleanup(func() { cancelT(); cancelC(); cancelA() })
	if err := chromedp.Do(ctx, chromedp.Navigate(url), waitDrawn(1)); err != nil {
		t.Fatalf("loading the page: %v", err)
	}
	return ctx
}

// void runs an action for its effect only.
func void[T any](a chromedp.Action[T]) chromedp.Action[chromedp.Void] {
	return func(ctx context.Context, t *chromedp.Target) (chromedp.Void, error) {
		_, err := a(ctx, t)
		return chromedp.Void{}, err
	}
}

// until waits until a JavaScript expression is true in the page.
func until(expr string) chromedp.Action[chromedp.Void] {
	return void(chromedp.Poll[bool](expr, chromedp.WithPollingInterval(5*time.Millisecond)))
}

// waitDrawn waits until the page has drawn n curves and has no request
// out or waiting.
func waitDrawn(n int) chromedp.Action[chromedp.Void] {
	return until(`window.tw && tw.draws >= ` + strconv.Itoa(n) + ` && tw.busy === 0 && !tw.queued`)
}

// settle waits until every request the page sent has been drawn or
// refused.
func settle() chromedp.Action[chromedp.Void] {
	return until(`window.tw && tw.busy === 0 && !tw.queued`)
}

// do runs steps, failing the test on an error.
func do(t testing.TB, ctx context.Context, steps ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	if err := chromedp.Do(ctx, steps...); err != nil {
		t.Fatal(err)
	}
}

// js evaluates a JavaScript expression (awaiting a promise it returns).
func js[T any](t testing.TB, ctx context.Context, expr string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("%s: %v", expr, err)
	}
	return v
}

// text reads the text of the element sel.
func text(t testing.TB, ctx context.Context, sel string) string {
	t.Helper()
	s, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS(sel)))
	if err != nil {
		t.Fatalf("%s: %v", sel, err)
	}
	return s
}

// shownDB reads a figure in dB as the page shows it ("−12.34 dB").
func shownDB(t *testing.T, ctx context.Context, id string) float64 {
	t.Helper()
	s := text(t, ctx, "#"+id)
	v, err := strconv.ParseFloat(strings.TrimSuffix(strings.ReplaceAll(strings.TrimSpace(s), "−", "-"), " dB"), 64)
	if err != nil {
		t.Fatalf("#%s shows %q, not a level in dB", id, s)
	}
	return v
}

// typeInto replaces a field's text by typing s (end it with kb.Enter).
func typeInto(sel, s string) chromedp.Action[chromedp.Void] {
	clear := chromedp.Evaluate[chromedp.Void](`document.querySelector(` + strconv.Quote(sel) + `).value = ""`)
	return chromedp.Steps(void(clear), chromedp.SendKeys(chromedp.CSS(sel), s))
}

// TestBrowser drives the page in headless Chromium: a slider, a part
// value, a bad value, a step, save, play.
func TestBrowser(t *testing.T) {
	requireBrowser(t)
	_, base, path := serve(t, Config{})
	ctx := browse(t, base+"/", 1360, 900)
	saved, err := networks.LoadDesign(path)
	if err != nil {
		t.Fatal(err)
	}
	original, _ := os.ReadFile(path)

	// The figures shown equal analyze at the setting to 0.01 dB (the page
	// shows them to 0.01 dB).
	checkFigures := func(t *testing.T, d *networks.Design, blend float64) {
		t.Helper()
		an, err := networks.Analyze(d, []float64{blend})
		if err != nil {
			t.Fatal(err)
		}
		p := an.Positions[0]
		if got := shownDB(t, ctx, "fig-gain-now"); math.Abs(got-p.Gain1kDB) > 0.01 {
			t.Errorf("blend %v: gain shown %v dB, analyze %v dB", blend, got, p.Gain1kDB)
		}
		if p.Scoop == nil {
			if s := text(t, ctx, "#fig-scoop-depth-now"); s != "—" {
				t.Errorf("blend %v: analyze finds no scoop, the page shows %q", blend, s)
			}
			return
		}
		if got := shownDB(t, ctx, "fig-scoop-depth-now"); math.Abs(got-p.Scoop.DepthDB) > 0.01 {
			t.Errorf("blend %v: scoop depth shown %v dB, analyze %v dB", blend, got, p.Scoop.DepthDB)
		}
		if got := shownDB(t, ctx, "fig-scoop-balance-now"); math.Abs(got-p.Scoop.BalanceDB) > 0.01 {
			t.Errorf("blend %v: scoop balance shown %v dB, analyze %v dB", blend, got, p.Scoop.BalanceDB)
		}
	}

	var blend float64
	t.Run("slider", func(t *testing.T) {
		// Thirteen presses of the left arrow on the focused slider: 0.5 to
		// 0.37 in steps of 0.01, each an input event.
		do(t, ctx,
			chromedp.Focus(chromedp.CSS("#knob-blend")),
			chromedp.SendKeys(chromedp.CSS("#knob-blend"), strings.Repeat(kb.ArrowLeft, 13)),
			settle())
		blend = js[float64](t, ctx, `tw.setting.blend`)
		if math.Abs(blend-0.37) > 1e-9 {
			t.Fatalf("blend after 13 steps down from 0.5: %v", blend)
		}
		checkFigures(t, saved, blend)
	})

	current := func() ([]float64, string) {
		return js[[]float64](t, ctx, `tw.last.curves.current`), js[string](t, ctx, `document.getElementById('plot').toDataURL()`)
	}

	t.Run("part value", func(t *testing.T) {
		before, png0 := current()
		draws := js[int](t, ctx, `tw.draws`)
		do(t, ctx, typeInto("#part-lowpass-r-value", "22k"+kb.Enter), waitDrawn(draws+1))
		after, png1 := current()
		moved := 0.0
		for i := range before {
			moved = math.Max(moved, math.Abs(after[i]-before[i]))
		}
		if moved < 0.5 {
			t.Errorf("the curve moved at most %.3f dB after lowpass.r 120k → 22k", moved)
		}
		if png0 == png1 {
			t.Error("the canvas did not change")
		}
		d := saved.Clone()
		d.Tone.Lowpass.R = 22e3
		checkFigures(t, d, blend)
	})

	t.Run("bad value", func(t *testing.T) {
		before, png0 := current()
		figs0 := text(t, ctx, "#figures")
		values0 := js[map[string]string](t, ctx, `tw.values`)
		do(t, ctx,
			typeInto("#part-highpass-c-value", "3n3k"+kb.Enter),
			chromedp.WaitVisible(chromedp.CSS("#part-highpass-c-msg")),
			settle())
		msg := text(t, ctx, "#part-highpass-c-msg")
		if !strings.Contains(msg, "3n3k") {
			t.Errorf("inline message %q does not name the value", msg)
		}
		after, png1 := current()
		if !equalFloats(before, after) || png0 != png1 || text(t, ctx, "#figures") != figs0 || !equalMaps(values0, js[map[string]string](t, ctx, `tw.values`)) {
			t.Error("a refused value changed the curve, the figures or the values")
		}
		// A good value again clears the message.
		do(t, ctx,
			typeInto("#part-highpass-c-value", "3n3"+kb.Enter),
			chromedp.WaitNotVisible(chromedp.CSS("#part-highpass-c-msg")))
		if js[bool](t, ctx, `document.getElementById('part-highpass-c-value').classList.contains('invalid')`) {
			t.Error("the field is still marked invalid after a good value")
		}
	})

	t.Run("step", func(t *testing.T) {
		do(t, ctx,
			chromedp.SetValue(chromedp.CSS("#series"), "E12"),
			chromedp.Click(chromedp.CSS("#part-filter1-r button:nth-of-type(2)")), // ▲
			until(`document.getElementById('part-filter1-r-value').value !== '24k'`),
			settle())
		v, err := chromedp.Run(ctx, chromedp.Value(chromedp.CSS("#part-filter1-r-value")))
		if err != nil {
			t.Fatal(err)
		}
		if v != "27k" { // IEC 60063 E12: 22, 27, 33; 24k is an E24 value between
			t.Errorf("24k stepped up in E12 to %q, want 27k", v)
		}
	})

	t.Run("save", func(t *testing.T) {
		do(t, ctx,
			chromedp.Click(chromedp.CSS("#save")),
			until(`document.getElementById('status').textContent.startsWith('saved')`),
			settle())
		status := text(t, ctx, "#status")
		d, err := networks.LoadDesign(path)
		if err != nil {
			t.Fatalf("the saved file does not read back: %v", err)
		}
		if d.Tone.Lowpass.R != 22e3 || d.Filters[0].R != 27e3 {
			t.Errorf("saved lowpass.r %v, filter1.r %v; want 22k and 27k", d.Tone.Lowpass.R, d.Filters[0].R)
		}
		checkFigures(t, d, blend)
		bak, err := os.ReadFile(path + BackupSuffix)
		if err != nil || string(bak) != string(original) {
			t.Errorf("the previous version is not kept as %s: %v", filepath.Base(path)+BackupSuffix, err)
		}
		if !strings.Contains(status, BackupSuffix) {
			t.Errorf("status %q does not mention the backup", status)
		}
	})

	t.Run("offline", func(t *testing.T) {
		// Everything the page loaded came from the server itself.
		urls := js[[]string](t, ctx, `[location.href, ...performance.getEntriesByType('resource').map((e) => e.name)]`)
		for _, u := range urls {
			if !strings.HasPrefix(u, base+"/") {
				t.Errorf("the page loaded %s, not from %s", u, base)
			}
		}
		if len(urls) < 3 {
			t.Errorf("resources %v: expected the page, its script and style at least", urls)
		}
	})

	t.Run("play", func(t *testing.T) {
		do(t, ctx,
			chromedp.Click(chromedp.CSS("#play")),
			until(`!document.getElementById('status').textContent.startsWith('rendering')`))
		status := text(t, ctx, "#status")
		if strings.Contains(status, "not available") {
			t.Skipf("audio rendering (the Listen issue) is not in this build: play shows %q; the rendering itself is not tested", status)
		}
		if !strings.HasPrefix(status, "playing") {
			t.Errorf("play: status %q", status)
		}
	})
}

func equalFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func equalMaps(a, b map[string]string) bool {
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if b[k] != v {
			return false
		}
	}
	return true
}

// BenchmarkSliderToRedraw measures in the browser, with performance.now(),
// the time from a slider's input event to the redrawn curve over 100
// moves, and reports the median and the 95th percentile. Not asserted.
func BenchmarkSliderToRedraw(b *testing.B) {
	requireBrowser(b)
	_, base, _ := serve(b, Config{Compare: loadModel(b, exampleDesign)})
	ctx := browse(b, base+"/", 1360, 900)
	const moves = 100
	script := `(async () => {
		const input = document.getElementById('knob-blend');
		const lat = [];
		for (let i = 0; i < ` + strconv.Itoa(moves) + `; i++) {
			const before = tw.draws;
			const k = i % 100;
			input.value = String((k < 50 ? k : 100 - k) / 50);
			input.dispatchEvent(new Event('input'));
			while (tw.draws === before) await new Promise((r) => setTimeout(r, 0));
			lat.push(tw.latencies[tw.latencies.length - 1]);
		}
		return lat;
	})()`
	var all []float64
	b.ResetTimer()
	for range b.N {
		all = append(all, js[[]float64](b, ctx, script)...)
	}
	b.StopTimer()
	sort.Float64s(all)
	b.ReportMetric(all[len(all)/2], "ms-median")
	b.ReportMetric(all[int(math.Ceil(0.95*float64(len(all))))-1], "ms-p95")
	b.ReportMetric(0, "ns/op")
}

// TestScreenshot writes the README's screenshot of the page:
//
//	go test ./cmd/tonewright/live -run Screenshot -screenshot
func TestScreenshot(t *testing.T) {
	if !*screenshot {
		t.Skip("writes the README's screenshot only with -screenshot")
	}
	requireBrowser(t)
	_, base, _ := serve(t, Config{Compare: loadModel(t, exampleDesign)})
	ctx := browse(t, base+"/", 1360, 1000)
	do(t, ctx,
		chromedp.Focus(chromedp.CSS("#knob-blend")),
		chromedp.SendKeys(chromedp.CSS("#knob-blend"), strings.Repeat(kb.ArrowLeft, 20)),
		settle(),
		typeInto("#part-lowpass-c-value", "18n"+kb.Enter),
		settle(),
		typeInto("#part-highpass-c-value", "4n7"+kb.Enter),
		settle(),
		void(chromedp.Evaluate[chromedp.Void](`document.activeElement.blur()`)),
		chromedp.MouseEvent(chromedp.MouseMoved, 560, 300),
		chromedp.Sleep(100*time.Millisecond))
	png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(screenshotPath, png, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("wrote %s", screenshotPath)
}
