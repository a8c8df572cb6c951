package repl

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// chart is a terminal plot over evenly spaced columns: one series is drawn
// as vertical bars with eighth-cell resolution (Unicode blocks) or as #
// columns (ASCII); several series as distinct markers. An optional
// horizontal reference line marks a target (the nominal level, a power
// goal).
type chart struct {
	xs       []float64 // x value of each column
	series   []series
	yLo, yHi float64
	ref      float64 // reference line; NaN for none
	height   int     // rows of the plot area
	ascii    bool
	digits   int
	xLabel   string
	width    int       // the screen width; a long x label moves to its own line
	marks    []float64 // x values marked under the axis
	markNote string    // what the marks are
}

type series struct {
	name string
	ys   []float64
}

var (
	eighths      = []rune(" ▁▂▃▄▅▆▇█")
	markers      = []rune("●○×+◆▲")
	asciiMarkers = []rune("*ox+#^")
)

// render returns the plot as lines ending in newlines.
func (c chart) render() string {
	if len(c.xs) == 0 || c.yHi <= c.yLo {
		return ""
	}
	cols, h := len(c.xs), c.height
	grid := make([][]rune, h)
	for r := range grid {
		grid[r] = []rune(strings.Repeat(" ", cols))
	}
	span := c.yHi - c.yLo
	refRow := -1
	if !math.IsNaN(c.ref) && c.ref >= c.yLo && c.ref <= c.yHi {
		refRow = int(math.Round((c.ref - c.yLo) / span * float64(h-1)))
	}
	if len(c.series) == 1 {
		for j, v := range c.series[0].ys {
			if math.IsNaN(v) {
				continue
			}
			e := int(math.Round(math.Max(0, math.Min(1, (v-c.yLo)/span)) * float64(h*8)))
			for r := 0; r < h; r++ {
				fill := min(max(e-8*r, 0), 8)
				switch {
				case !c.ascii:
					grid[h-1-r][j] = eighths[fill]
				case fill >= 4:
					grid[h-1-r][j] = '#'
				case fill > 0:
					grid[h-1-r][j] = '.'
				}
			}
		}
	} else {
		for i, s := range c.series {
			m := markers[i%len(markers)]
			if c.ascii {
				m = asciiMarkers[i%len(asciiMarkers)]
			}
			for j, v := range s.ys {
				if math.IsNaN(v) {
					continue
				}
				v = math.Max(c.yLo, math.Min(c.yHi, v)) // out of range: drawn on the edge row
				r := int(math.Round((v - c.yLo) / span * float64(h-1)))
				grid[h-1-r][j] = m
			}
		}
	}
	if refRow >= 0 {
		line := '┈'
		if c.ascii {
			line = '-'
		}
		row := grid[h-1-refRow]
		for j := range row {
			if row[j] == ' ' {
				row[j] = line
			}
		}
	}
	// y labels: top, bottom and the reference row.
	labels := make([]string, h)
	labels[0] = axisNum(c.yHi, c.digits)
	labels[h-1] = axisNum(c.yLo, c.digits)
	if refRow >= 0 && refRow != 0 && refRow != h-1 {
		labels[h-1-refRow] = axisNum(c.ref, c.digits)
	}
	lw := 0
	for _, l := range labels {
		lw = max(lw, len(l))
	}
	vbar, corner, hbar := "│", "└", "─"
	if c.ascii {
		vbar, corner, hbar = "|", "+", "-"
	}
	var sb strings.Builder
	for r := 0; r < h; r++ {
		sb.WriteString(strings.Repeat(" ", lw-len(labels[r])))
		sb.WriteString(labels[r])
		sb.WriteString(" ")
		sb.WriteString(vbar)
		sb.WriteString(strings.TrimRight(string(grid[r]), " "))
		sb.WriteByte('\n')
	}
	sb.WriteString(strings.Repeat(" ", lw+1))
	sb.WriteString(corner)
	sb.WriteString(strings.Repeat(hbar, cols))
	sb.WriteByte('\n')
	if len(c.marks) > 0 {
		m := '▲'
		if c.ascii {
			m = '^'
		}
		line := []rune(strings.Repeat(" ", cols))
		for _, x := range c.marks {
			for j, xv := range c.xs {
				if xv == x || (j+1 < cols && xv < x && c.xs[j+1] > x) {
					line[j] = m
					break
				}
			}
		}
		sb.WriteString(strings.Repeat(" ", lw+2))
		sb.WriteString(strings.TrimRight(string(line), " "))
		sb.WriteString("  " + string(m) + " " + c.markNote + "\n")
	}
	sb.WriteString(strings.Repeat(" ", lw+2))
	sb.WriteString(c.xAxis(cols))
	sb.WriteByte('\n')
	if len(c.series) > 1 {
		sb.WriteString(strings.Repeat(" ", lw+2))
		for i, s := range c.series {
			m := markers[i%len(markers)]
			if c.ascii {
				m = asciiMarkers[i%len(asciiMarkers)]
			}
			if i > 0 {
				sb.WriteString("   ")
			}
			sb.WriteRune(m)
			sb.WriteByte(' ')
			sb.WriteString(s.name)
		}
		sb.WriteByte('\n')
	}
	return sb.String()
}

// xAxis returns the x labels: first, middle and last column values, and
// the axis name after them when it fits.
func (c chart) xAxis(cols int) string {
	first := formatAxis(c.xs[0], c.digits)
	last := formatAxis(c.xs[cols-1], c.digits)
	line := []rune(strings.Repeat(" ", cols))
	put := func(at int, s string) {
		for i, r := range []rune(s) {
			if at+i >= 0 && at+i < len(line) {
				line[at+i] = r
			}
		}
	}
	put(0, first)
	if cols > len(first)+len(last)+12 {
		mid := formatAxis(c.xs[cols/2], c.digits)
		put(cols/2-len(mid)/2, mid)
	}
	put(cols-utf8.RuneCountInString(last), last)
	out := strings.TrimRight(string(line), " ")
	if c.xLabel == "" {
		return out
	}
	if c.width > 0 && utf8.RuneCountInString(out)+len(c.xLabel)+2+c.labelWidth()+2 > c.width {
		return out + "\n" + strings.Repeat(" ", c.labelWidth()+2) + c.xLabel
	}
	return out + "  " + c.xLabel
}

// labelWidth is the width of the y labels.
func (c chart) labelWidth() int {
	w := max(len(axisNum(c.yHi, c.digits)), len(formatNum(c.yLo, c.digits)))
	if !math.IsNaN(c.ref) {
		w = max(w, len(axisNum(c.ref, c.digits)))
	}
	return w
}

// formatAxis prints an axis value compactly: integers plainly, others with
// up to the given significant digits and no trailing zeros.
func formatAxis(x float64, digits int) string {
	if x == math.Trunc(x) && math.Abs(x) < 1e15 {
		return strconv.FormatInt(int64(x), 10)
	}
	s := formatNum(x, min(digits, 3))
	if strings.Contains(s, ".") && !strings.Contains(s, "e") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// plotColumns is the number of plot columns that fit the session width
// beside a y axis of labelWidth characters.
func (s *Session) plotColumns(labelWidth int) int {
	return max(10, s.Set.Width-labelWidth-3)
}

// niceRange widens [lo, hi] outward to multiples of step, clamped to
// [floor, ceil].
func niceRange(lo, hi, step, floor, ceil float64) (float64, float64) {
	lo = math.Max(floor, math.Floor(lo/step)*step)
	hi = math.Min(ceil, math.Ceil(hi/step)*step)
	if hi <= lo {
		hi = math.Min(ceil, lo+step)
		if hi <= lo {
			lo = hi - step
		}
	}
	return lo, hi
}
