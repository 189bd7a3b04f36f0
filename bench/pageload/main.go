// Command pageload measures how a rendered site's index loads in headless
// Chromium: the size of index.html and of everything its first load
// fetches, the time to its load event, and the time from a click on a
// column heading to the sorted rows (the first sort loads the rows script
// of a paged index).
//
//	go run ./bench/pageload [-runs 7] [-chromium /usr/bin/chromium] SITE
//
// Each run starts a fresh browser with an empty profile and opens
// file://SITE/index.html, as a reader opening a site from disk would; the
// load time is the page's own navigation timing (loadEventEnd, from the
// start of the navigation), and the browser's start is not counted. One
// run before the measured ones warms the file system cache and is
// reported apart. Every run goes to stderr; stdout gets one line of
// tab-separated medians:
//
//	index_bytes first_load_bytes load_ms_median load_ms_max rows_bytes sort_ms_median runs
//
// rows_bytes and sort_ms_median are 0 and NaN for an index that is not
// paged. Run it on a quiet machine; bench/run.sh -m index runs it after a
// render.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"github.com/chromedp/chromedp"
)

func main() {
	if err := run(os.Args[1:], os.Stdout, os.Stderr); err != nil {
		if !errors.Is(err, flag.ErrHelp) {
			fmt.Fprintln(os.Stderr, "pageload:", err)
		}
		os.Exit(2)
	}
}

// sample is what one run measures.
type sample struct {
	loadMS     float64 // navigation start to the end of the load event
	firstBytes int64   // index.html and what its first load fetched
	rowsBytes  int64   // the rows script, 0 when not paged
	sortMS     float64 // click on a heading to sorted rows; NaN when not paged
}

func run(args []string, stdout, stderr io.Writer) error {
	fl := flag.NewFlagSet("pageload", flag.ContinueOnError)
	fl.SetOutput(stderr)
	runs := fl.Int("runs", 7, "measured runs (one warm-up run comes first)")
	chromium := fl.String("chromium", "/usr/bin/chromium", "the browser")
	if err := fl.Parse(args); err != nil {
		return err
	}
	if fl.NArg() != 1 || *runs < 1 {
		fl.Usage()
		return errors.New("want one site folder and -runs of at least 1")
	}
	site, err := filepath.Abs(fl.Arg(0))
	if err != nil {
		return err
	}
	index := filepath.Join(site, "index.html")
	info, err := os.Stat(index)
	if err != nil {
		return err
	}
	var got []sample
	for k := 0; k <= *runs; k++ {
		s, err := once(*chromium, site)
		if err != nil {
			return fmt.Errorf("run %d: %w", k, err)
		}
		what := fmt.Sprintf("run %d", k)
		if k == 0 {
			what = "warm-up run"
		} else {
			got = append(got, s)
		}
		fmt.Fprintf(stderr, "pageload: %s: load %.0f ms, first load %d bytes, rows script %d bytes, first sort %.0f ms\n",
			what, s.loadMS, s.firstBytes, s.rowsBytes, s.sortMS)
	}
	loads := make([]float64, len(got))
	sorts := make([]float64, len(got))
	for i, s := range got {
		loads[i], sorts[i] = s.loadMS, s.sortMS
	}
	fmt.Fprintf(stdout, "%d\t%d\t%.0f\t%.0f\t%d\t%.0f\t%d\n", info.Size(), got[0].firstBytes, median(loads), slices.Max(loads),
		got[0].rowsBytes, median(sorts), len(got))
	return nil
}

// median returns the median of xs (NaN if any is NaN).
func median(xs []float64) float64 {
	s := slices.Clone(xs)
	for _, x := range s {
		if math.IsNaN(x) {
			return math.NaN()
		}
	}
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// once starts a browser, loads the index and sorts it once.
func once(chromium, site string) (sample, error) {
	profile, err := os.MkdirTemp("", "pageload-")
	if err != nil {
		return sample{}, err
	}
	defer os.RemoveAll(profile)
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(ctx,
		chromedp.ExecPath(chromium),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1280, 1800),
	)
	defer cancelAlloc()
	bctx, cancelBrowser := chromedp.NewContext(allocCtx)
	defer cancelBrowser()
	if err := chromedp.Do(bctx); err != nil { // starts the browser and opens the tab
		return sample{}, fmt.Errorf("starting %s: %w", chromium, err)
	}

	u := (&url.URL{Scheme: "file", Path: filepath.ToSlash(filepath.Join(site, "index.html"))}).String()
	err = chromedp.Do(bctx,
		chromedp.Navigate(u),
		chromedp.Poll[chromedp.Void](`document.readyState === "complete" && performance.getEntriesByType('navigation')[0].loadEventEnd > 0`,
			chromedp.WithPollingTimeout(time.Minute)),
	)
	if err != nil {
		return sample{}, fmt.Errorf("loading %s: %w", u, err)
	}
	var s sample
	s.loadMS, err = chromedp.Run(bctx, chromedp.Evaluate[float64](`performance.getEntriesByType('navigation')[0].loadEventEnd`))
	if err != nil {
		return sample{}, err
	}
	// Resource timing lists nothing loaded from file://: the page's own
	// stylesheets, scripts and images are what it fetched.
	names, err := chromedp.Run(bctx, chromedp.Evaluate[[]string](fetchedJS))
	if err != nil {
		return sample{}, err
	}
	s.firstBytes, err = fileBytes(names)
	if err != nil {
		return sample{}, err
	}

	paged, err := chromedp.Run(bctx, chromedp.Evaluate[bool](`!!document.querySelector('#library-table[data-rows]')`))
	if err != nil || !paged {
		s.sortMS = math.NaN()
		return s, err
	}
	start := time.Now()
	err = chromedp.Do(bctx,
		chromedp.Click(chromedp.CSS(`#library-table button[data-sort-key="solar_reflectance"]`)),
		chromedp.Poll[chromedp.Void](`window.skysheetRows !== undefined && document.querySelector('#library-table th[aria-sort]') !== null && document.querySelector('.pager').hidden`,
			chromedp.WithPollingTimeout(time.Minute)),
	)
	if err != nil {
		return sample{}, fmt.Errorf("sorting: %w", err)
	}
	s.sortMS = float64(time.Since(start).Microseconds()) / 1000
	rows, err := chromedp.Run(bctx, chromedp.Evaluate[[]string](`Array.from(document.querySelectorAll('script[src]')).map(e => e.src).filter(n => n.endsWith('/rows.js'))`))
	if err != nil {
		return sample{}, err
	}
	s.rowsBytes, err = fileBytes(rows)
	return s, err
}

// fetchedJS lists the page and the files it names for loading: its
// stylesheets, scripts and images, each once.
const fetchedJS = `Array.from(new Set([location.href.split('#')[0]].concat(
	Array.from(document.querySelectorAll('link[rel~="stylesheet"][href], link[rel~="icon"][href]')).map(e => e.href),
	Array.from(document.querySelectorAll('script[src]')).map(e => e.src),
	Array.from(document.querySelectorAll('img[src]')).map(e => e.src))))`

// fileBytes adds up the sizes of the files behind file:// URLs; other
// URLs (none on a site opened from disk) are an error.
func fileBytes(urls []string) (int64, error) {
	var n int64
	for _, raw := range urls {
		u, err := url.Parse(raw)
		if err != nil {
			return 0, err
		}
		if u.Scheme != "file" {
			return 0, fmt.Errorf("the page fetched %s, not a file", raw)
		}
		info, err := os.Stat(filepath.FromSlash(strings.TrimSuffix(u.Path, "/")))
		if err != nil {
			return 0, err
		}
		n += info.Size()
	}
	return n, nil
}
