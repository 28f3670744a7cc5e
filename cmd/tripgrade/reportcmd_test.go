package main

import (
	"bytes"
	"context"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/tcc"
)

// hostileStudy copies the grading study (R1 over R2, the margin fails)
// with names a report must escape: markup, quotes, an ampersand.
func hostileStudy(t *testing.T) string {
	t.Helper()
	src, err := os.ReadFile("../../testdata/checks/grading.toml")
	if err != nil {
		t.Fatal(err)
	}
	r := strings.NewReplacer(
		`name = "grading fails"`, `name = "<img src=x onerror=alert(1)> & <b>bold</b>"`,
		`"R1"`, `"R1 <script>alert(1)</script>"`,
		`"R2"`, `"R2\" onmouseover=\"alert(2)"`)
	path := filepath.Join(t.TempDir(), "hostile.toml")
	if err := os.WriteFile(path, []byte(r.Replace(string(src))), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func writeReportOf(t *testing.T, study string, args ...string) (string, string) {
	t.Helper()
	out := filepath.Join(t.TempDir(), "report.html")
	t.Setenv("SOURCE_DATE_EPOCH", "1764633600")
	code, text, errOut := runArgs(append([]string{"check", study, "--report", out}, args...)...)
	if code == exitUsage || !strings.Contains(errOut, "wrote "+out) {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	return string(data), text
}

// The report is self-contained: a policy that forbids every load but its
// own style and data: images, no script, no external reference; every
// piece of user text escaped.
func TestReportSelfContainedAndEscaped(t *testing.T) {
	html, _ := writeReportOf(t, hostileStudy(t))
	for _, want := range []string{
		`<meta http-equiv="Content-Security-Policy" content="default-src &#39;none&#39;; img-src data:; style-src &#39;sha256-`,
		"script-src &#39;none&#39;",
		"&lt;img src=x onerror=alert(1)&gt; &amp; &lt;b&gt;bold&lt;/b&gt;",
		"R1 &lt;script&gt;alert(1)&lt;/script&gt;",
		"R2&#34; onmouseover=&#34;alert(2)",
		"2025-12-02 00:00 UTC",
		"Caution: these results support",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	for _, bad := range []string{"http://", "https://", "@import", "url("} {
		if strings.Contains(html, bad) {
			t.Errorf("report contains %q", bad)
		}
	}
	checkMarkup(t, html, 2) // the path's chart and the failing pair's
	for _, m := range regexp.MustCompile(`src="([^"]*)"`).FindAllStringSubmatch(html, -1) {
		if !strings.HasPrefix(m[1], "data:image/png;base64,") {
			t.Errorf("an image from outside the file: %.60s", m[1])
		}
	}
}

// The report names the SHA-256 of the study file and of the settings
// table it reads; one byte changed in either changes its digest, and an
// unchanged input gives the same digest (and the same report).
func TestReportHashes(t *testing.T) {
	dir := t.TempDir()
	for _, f := range []string{"fenwick-quay.toml", "fenwick-quay-settings.csv"} {
		data, _ := os.ReadFile("../../examples/" + f)
		os.WriteFile(filepath.Join(dir, f), data, 0o644)
	}
	study := filepath.Join(dir, "fenwick-quay.toml")
	csvPath := filepath.Join(dir, "fenwick-quay-settings.csv")
	hashes := func() (string, string, string) {
		html, _ := writeReportOf(t, study)
		m := regexp.MustCompile(`<td>([^<]*)</td><td class="hash">([0-9a-f]{64})</td>`).FindAllStringSubmatch(html, -1)
		if len(m) != 2 || m[0][1] != study || m[1][1] != csvPath {
			t.Fatalf("input rows %v, want the study then the CSV", m)
		}
		return m[0][2], m[1][2], html
	}
	s0, c0, h0 := hashes()
	s1, c1, h1 := hashes()
	if s0 != s1 || c0 != c1 || h0 != h1 {
		t.Errorf("the same input gave different digests or reports")
	}
	// sha256sum of the bundled file, computed independently of the code.
	if want := sha256File(t, "../../examples/fenwick-quay.toml"); s0 != want {
		t.Errorf("study digest %s, want %s", s0, want)
	}
	appendByte := func(path string) {
		f, _ := os.OpenFile(path, os.O_APPEND|os.O_WRONLY, 0)
		f.Write([]byte("\n"))
		f.Close()
	}
	appendByte(csvPath)
	s2, c2, _ := hashes()
	if s2 != s0 || c2 == c0 {
		t.Errorf("one byte more in the CSV: study %v→%v, CSV %v→%v; want only the CSV's digest to change", s0, s2, c0, c2)
	}
	appendByte(study)
	s3, c3, _ := hashes()
	if s3 == s2 || c3 != c2 {
		t.Errorf("one byte more in the study: only the study's digest should change")
	}
}

// sha256File runs the system's sha256sum, an implementation apart from
// Go's crypto/sha256; the test skips the comparison where it is missing.
func sha256File(t *testing.T, path string) string {
	out, err := exec.Command("sha256sum", path).Output()
	if err != nil {
		t.Skipf("sha256sum: %v", err)
	}
	return strings.Fields(string(out))[0]
}

// chromium finds a Chromium to test the report in; CI requires it
// (TRIPGRADE_REQUIRE_CHROMIUM=1), elsewhere the test skips without one.
func chromium(t *testing.T) string {
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("TRIPGRADE_REQUIRE_CHROMIUM") == "1" {
		t.Fatal("chromium is required (TRIPGRADE_REQUIRE_CHROMIUM=1) but not installed: apt-get install chromium")
	}
	t.Skip("chromium not installed (Debian: apt-get install chromium)")
	return ""
}

// runChromium runs headless Chromium with a fresh profile and no network
// chatter of its own.
func runChromium(t *testing.T, bin string, args ...string) []byte {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	base := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir=" + t.TempDir()}
	cmd := exec.CommandContext(ctx, bin, append(base, args...)...)
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium %v: %v\n%s", args, err, stderr.String())
	}
	return stdout.Bytes()
}

// The report as a browser shows it: Chromium loads it under its own
// policy, the verdict line and the count of each verdict's rows are
// those of the check, no markup from a name became an element, and a
// screenshot is taken (kept in TRIPGRADE_SCREENSHOT_DIR when set, for a
// person to look at).
func TestReportInChromium(t *testing.T) {
	bin := chromium(t)
	for _, c := range []struct {
		name, study string
		verdict     string
		rows        map[string]int
	}{
		{"fenwick-accepted", "../../testdata/accept/fenwick-accepted.toml", "71 PASS, 2 WARN, 6 FAIL, 2 ACCEPTED: FAIL",
			map[string]int{"fail": 6, "accepted": 2, "warn": 2, "pass": 71}},
		{"hostile", hostileStudy(t), "", nil},
	} {
		t.Run(c.name, func(t *testing.T) {
			html, _ := writeReportOf(t, c.study)
			page := filepath.Join(t.TempDir(), "report.html")
			os.WriteFile(page, []byte(html), 0o644)
			dom := string(runChromium(t, bin, "--dump-dom", "file://"+page))
			if !strings.Contains(dom, "Coordination audit: ") || !strings.Contains(dom, "Caution: these results support") {
				t.Fatalf("Chromium's DOM lacks the report's text:\n%.500s", dom)
			}
			if c.verdict != "" && !strings.Contains(dom, `id="verdict">`+c.verdict+`<`) {
				t.Errorf("verdict line is not %q", c.verdict)
			}
			for class, n := range c.rows {
				if got := strings.Count(dom, `<tr class="`+class+`"><td class="verdict">`); got != n {
					t.Errorf("%d %s rows in the browser, want %d", got, class, n)
				}
			}
			checkMarkup(t, dom, -1)
			shot := filepath.Join(t.TempDir(), c.name+".png")
			if dir := os.Getenv("TRIPGRADE_SCREENSHOT_DIR"); dir != "" {
				shot = filepath.Join(dir, c.name+".png")
			}
			runChromium(t, bin, "--window-size=1280,2400", "--hide-scrollbars", "--screenshot="+shot, "file://"+page)
			checkScreenshot(t, shot)
		})
	}
}

// checkScreenshot fails unless the screenshot decodes and shows ink:
// some dark pixels (text) and some of the report's red (the caution).
func checkScreenshot(t *testing.T, path string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	dark, red := 0, 0
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r < 0x4000 && g < 0x4000 && bl < 0x4000 {
				dark++
			}
			if r > 0xa000 && g < 0x3000 && bl < 0x3000 {
				red++
			}
		}
	}
	if dark < 1000 || red < 50 {
		t.Errorf("screenshot %s: %d dark and %d red pixels sampled; the page looks empty or unstyled", path, dark, red)
	}
}

// checkMarkup reads the elements and attributes of an HTML text (a small
// tokenizer: tags, quoted attribute values, comments) and fails on a
// script, a link, a frame or object, an event-handler attribute, or
// (when imgs ≥ 0) a number of images other than imgs.
func checkMarkup(t *testing.T, doc string, imgs int) {
	t.Helper()
	tags, attrs := markup(doc)
	n := 0
	for _, tag := range tags {
		switch tag {
		case "script", "link", "iframe", "object", "embed", "base", "form":
			t.Errorf("element <%s> in the report", tag)
		case "img":
			n++
		}
	}
	for _, a := range attrs {
		if strings.HasPrefix(a, "on") {
			t.Errorf("event-handler attribute %q in the report", a)
		}
	}
	if imgs >= 0 && n != imgs {
		t.Errorf("%d images, want %d", n, imgs)
	}
}

func markup(doc string) (tags, attrs []string) {
	isName := func(c byte) bool {
		return c == '-' || c == ':' || c >= '0' && c <= '9' || c|0x20 >= 'a' && c|0x20 <= 'z'
	}
	i := 0
	for i < len(doc) {
		if doc[i] != '<' {
			i++
			continue
		}
		if strings.HasPrefix(doc[i:], "<!--") {
			end := strings.Index(doc[i:], "-->")
			if end < 0 {
				return
			}
			i += end + 3
			continue
		}
		j := i + 1
		if j < len(doc) && doc[j] == '/' {
			j++
		}
		k := j
		for k < len(doc) && isName(doc[k]) {
			k++
		}
		if k == j {
			i++ // a "<" in text
			continue
		}
		tags = append(tags, strings.ToLower(doc[j:k]))
		for k < len(doc) && doc[k] != '>' {
			switch c := doc[k]; {
			case c == '"' || c == '\'':
				end := strings.IndexByte(doc[k+1:], c)
				if end < 0 {
					return
				}
				k += end + 2
			case isName(c):
				a := k
				for k < len(doc) && isName(doc[k]) {
					k++
				}
				attrs = append(attrs, strings.ToLower(doc[a:k]))
			default:
				k++
			}
		}
		i = k + 1
	}
	return tags, attrs
}

// The report embeds at most the chart limit, the linked charts of
// failing findings first.
func TestChooseCharts(t *testing.T) {
	names := []string{"path-a", "path-b", "pair-x", "pair-y"}
	var charts []*tcc.Chart
	for _, n := range names {
		charts = append(charts, &tcc.Chart{Name: n})
	}
	rows := []report.Row{{Finding: &coord.Finding{Verdict: coord.Pass}}, {Finding: &coord.Finding{Verdict: coord.Fail}}, {Finding: &coord.Finding{Verdict: coord.Accepted}}}
	linked := []string{"path-a", "pair-y", "pair-x"}
	got := chooseCharts(charts, nil, linked, rows, 2)
	if len(got) != 2 || !got["pair-y"] || !got["pair-x"] {
		t.Errorf("chose %v, want the two linked from failing and accepted rows", got)
	}
	if got := chooseCharts(charts, nil, linked, rows, 10); len(got) != 4 {
		t.Errorf("chose %v, want all four", got)
	}
}
