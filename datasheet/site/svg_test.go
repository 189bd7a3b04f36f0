package site

import (
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// svgText is a <text> element of a chart.
type svgText struct {
	x, y int
	size float64 // font size in SVG units
	fill string
	body string
}

// svgPath is a <path> element of a chart.
type svgPath struct {
	pts    [][2]int
	width  int
	stroke string
	fill   string
	dashed bool
}

var (
	textRE     = regexp.MustCompile(`<text x="(-?\d+)" y="(-?\d+)" style="([^"]*)"[^>]*>([^<]*)</text>`)
	pathRE     = regexp.MustCompile(`<path (stroke-dasharray="[^"]*")? *d="([^"]*)" style="([^"]*)"/>`)
	pointRE    = regexp.MustCompile(`[ML] (-?\d+) (-?\d+)`)
	fontSizeRE = regexp.MustCompile(`font-size:([0-9.]+)px`)
)

// styleOf returns a property of an inline style.
func styleOf(style, key string) string {
	for _, kv := range strings.Split(style, ";") {
		if k, v, ok := strings.Cut(kv, ":"); ok && k == key {
			return v
		}
	}
	return ""
}

func svgTexts(t *testing.T, svg string) []svgText {
	t.Helper()
	var out []svgText
	for _, m := range textRE.FindAllStringSubmatch(svg, -1) {
		x, _ := strconv.Atoi(m[1])
		y, _ := strconv.Atoi(m[2])
		st := svgText{x: x, y: y, fill: styleOf(m[3], "fill"), body: m[4]}
		if fs := fontSizeRE.FindStringSubmatch(m[3]); fs != nil {
			st.size, _ = strconv.ParseFloat(fs[1], 64)
		}
		out = append(out, st)
	}
	if len(out) == 0 {
		t.Fatalf("no text in the SVG")
	}
	return out
}

func svgPaths(svg string) []svgPath {
	var out []svgPath
	for _, m := range pathRE.FindAllStringSubmatch(svg, -1) {
		p := svgPath{dashed: m[1] != "", stroke: styleOf(m[3], "stroke"), fill: styleOf(m[3], "fill")}
		p.width, _ = strconv.Atoi(styleOf(m[3], "stroke-width"))
		for _, pt := range pointRE.FindAllStringSubmatch(m[2], -1) {
			x, _ := strconv.Atoi(pt[1])
			y, _ := strconv.Atoi(pt[2])
			p.pts = append(p.pts, [2]int{x, y})
		}
		out = append(out, p)
	}
	return out
}

// svgColor is how go-chart writes a colour.
func svgColor(c rgba) string { return c.color().String() }

// textNamed returns the text with the given body.
func textNamed(t *testing.T, texts []svgText, body string) svgText {
	t.Helper()
	for _, x := range texts {
		if x.body == body {
			return x
		}
	}
	t.Fatalf("no text %q", body)
	return svgText{}
}

// xAxisLine returns the left and right end and the height of the x axis:
// the first horizontal two-point line in the axis colour.
func xAxisLine(t *testing.T, paths []svgPath) (left, right, y int) {
	t.Helper()
	for _, p := range paths {
		if p.stroke == svgColor(colAxis) && len(p.pts) == 2 && p.pts[0][1] == p.pts[1][1] && p.pts[1][0]-p.pts[0][0] > 100 {
			return p.pts[0][0], p.pts[1][0], p.pts[0][1]
		}
	}
	t.Fatal("no x axis line")
	return 0, 0, 0
}

// circleRE matches a point of a scatter chart.
var circleRE = regexp.MustCompile(`<circle cx="(-?\d+)" cy="(-?\d+)"`)

// regexpTexts returns the point labels of a scatter chart: the texts
// inside its links.
func regexpTexts(svg string) []svgText {
	var out []svgText
	for _, a := range regexp.MustCompile(`(?s)<a [^>]*>.*?</a>`).FindAllString(svg, -1) {
		for _, m := range textRE.FindAllStringSubmatch(a, -1) {
			x, _ := strconv.Atoi(m[1])
			y, _ := strconv.Atoi(m[2])
			st := svgText{x: x, y: y, fill: styleOf(m[3], "fill"), body: m[4]}
			if fs := fontSizeRE.FindStringSubmatch(m[3]); fs != nil {
				st.size, _ = strconv.ParseFloat(fs[1], 64)
			}
			out = append(out, st)
		}
	}
	return out
}
