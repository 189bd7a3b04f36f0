package site

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/golang/freetype/truetype"
	"github.com/wcharczuk/go-chart/v2"
	"github.com/wcharczuk/go-chart/v2/drawing"
)

// svgWriter is a chart.Renderer that writes the very bytes go-chart's own
// SVG renderer writes (see TestCachedSVGIdentical), with less work: path
// commands and styles are appended to one buffer instead of being
// formatted one by one with fmt and joined, and text is measured with the
// cached faces. A library's charts spend most of their time here.
type svgWriter struct {
	b     bytes.Buffer
	path  []byte // the path under construction: commands separated by newlines
	dpi   float64
	theta *float64 // text rotation, radians
	s     chart.Style
}

// newSVGWriter starts an SVG of the given size.
func newSVGWriter(w, h int) (chart.Renderer, error) {
	r := &svgWriter{dpi: chart.DefaultDPI}
	r.b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" viewBox="0 0 `)
	r.int(w)
	r.b.WriteByte(' ')
	r.int(h)
	r.b.WriteString(`">`)
	return r, nil
}

func (r *svgWriter) int(v int) { r.b.Write(strconv.AppendInt(r.b.AvailableBuffer(), int64(v), 10)) }

func (r *svgWriter) ResetStyle()                         { r.s = chart.Style{Font: r.s.Font} }
func (r *svgWriter) GetDPI() float64                     { return r.dpi }
func (r *svgWriter) SetDPI(dpi float64)                  { r.dpi = dpi }
func (r *svgWriter) SetClassName(name string)            { r.s.ClassName = name }
func (r *svgWriter) SetStrokeColor(c drawing.Color)      { r.s.StrokeColor = c }
func (r *svgWriter) SetFillColor(c drawing.Color)        { r.s.FillColor = c }
func (r *svgWriter) SetStrokeWidth(width float64)        { r.s.StrokeWidth = width }
func (r *svgWriter) SetStrokeDashArray(dashes []float64) { r.s.StrokeDashArray = dashes }
func (r *svgWriter) SetFont(f *truetype.Font)            { r.s.Font = f }
func (r *svgWriter) SetFontColor(c drawing.Color)        { r.s.FontColor = c }
func (r *svgWriter) SetFontSize(size float64)            { r.s.FontSize = size }
func (r *svgWriter) SetTextRotation(radians float64)     { r.theta = &radians }
func (r *svgWriter) ClearTextRotation()                  { r.theta = nil }
func (r *svgWriter) Close()                              { r.command("Z") }
func (r *svgWriter) Stroke()                             { r.drawPath() }
func (r *svgWriter) Fill()                               { r.drawPath() }
func (r *svgWriter) FillStroke()                         { r.drawPath() }
func (r *svgWriter) MoveTo(x, y int)                     { r.point('M', x, y) }
func (r *svgWriter) LineTo(x, y int)                     { r.point('L', x, y) }
func (r *svgWriter) QuadCurveTo(cx, cy, x, y int) {
	r.command(fmt.Sprintf("Q%d,%d %d,%d", cx, cy, x, y))
}
func (r *svgWriter) Save(w io.Writer) error {
	r.b.WriteString("</svg>")
	_, err := w.Write(r.b.Bytes())
	return err
}

// next starts a path command: commands are separated by newlines.
func (r *svgWriter) next() {
	if len(r.path) > 0 {
		r.path = append(r.path, '\n')
	}
}

// command adds a path command.
func (r *svgWriter) command(c string) {
	r.next()
	r.path = append(r.path, c...)
}

// point adds "M x y" or "L x y".
func (r *svgWriter) point(op byte, x, y int) {
	r.next()
	r.path = append(r.path, op, ' ')
	r.path = strconv.AppendInt(r.path, int64(x), 10)
	r.path = append(r.path, ' ')
	r.path = strconv.AppendInt(r.path, int64(y), 10)
}

// ArcTo adds an arc as go-chart does: a line or move to its start, then
// the arc.
func (r *svgWriter) ArcTo(cx, cy int, rx, ry, startAngle, delta float64) {
	startAngle = chart.RadianAdd(startAngle, math.Pi/2)
	endAngle := chart.RadianAdd(startAngle, delta)
	startx := cx + int(rx*math.Sin(startAngle))
	starty := cy - int(ry*math.Cos(startAngle))
	if len(r.path) > 0 {
		r.point('L', startx, starty)
	} else {
		r.point('M', startx, starty)
	}
	endx := cx + int(rx*math.Sin(endAngle))
	endy := cy - int(ry*math.Cos(endAngle))
	large := 0
	if delta > math.Pi {
		large = 1
	}
	r.command(fmt.Sprintf("A %d %d %0.2f %d 1 %d %d", int(rx), int(ry), chart.RadiansToDegrees(delta), large, endx, endy))
}

// drawPath writes the path with the fill and stroke of the style (go-chart
// writes both whether the path was stroked, filled or both) and clears it.
func (r *svgWriter) drawPath() {
	s := r.s.GetFillAndStrokeOptions()
	r.b.WriteString("<path ")
	if len(s.StrokeDashArray) > 0 {
		r.b.WriteString(`stroke-dasharray="`)
		for i, v := range s.StrokeDashArray {
			if i > 0 {
				r.b.WriteString(", ")
			}
			r.b.Write(strconv.AppendFloat(r.b.AvailableBuffer(), v, 'f', 1, 64))
		}
		r.b.WriteByte('"')
	}
	r.b.WriteString(` d="`)
	r.b.Write(r.path)
	r.b.WriteString(`" `)
	r.style(s)
	r.b.WriteString("/>")
	r.path = r.path[:0]
}

func (r *svgWriter) Circle(radius float64, x, y int) {
	r.b.WriteString(`<circle cx="`)
	r.int(x)
	r.b.WriteString(`" cy="`)
	r.int(y)
	r.b.WriteString(`" r="`)
	r.int(int(radius))
	r.b.WriteString(`" `)
	r.style(r.s.GetFillAndStrokeOptions())
	r.b.WriteString("/>")
}

func (r *svgWriter) Text(body string, x, y int) {
	r.b.WriteString(`<text x="`)
	r.int(x)
	r.b.WriteString(`" y="`)
	r.int(y)
	r.b.WriteString(`" `)
	r.style(r.s.GetTextOptions())
	if r.theta != nil {
		r.b.WriteString(` transform="rotate(`)
		r.b.Write(strconv.AppendFloat(r.b.AvailableBuffer(), chart.RadiansToDegrees(*r.theta), 'f', 2, 64))
		r.b.WriteByte(',')
		r.int(x)
		r.b.WriteByte(',')
		r.int(y)
		r.b.WriteString(`)"`)
	}
	r.b.WriteByte('>')
	r.b.WriteString(body)
	r.b.WriteString("</text>")
}

// style writes the style attribute (or class) as go-chart's canvas does.
func (r *svgWriter) style(s chart.Style) {
	if s.ClassName != "" {
		r.b.WriteString(`class="`)
		r.b.WriteString(s.ClassName)
		if !s.StrokeColor.IsZero() {
			r.b.WriteString(" stroke")
		}
		if !s.FillColor.IsZero() {
			r.b.WriteString(" fill")
		}
		if s.FontSize != 0 || s.Font != nil {
			r.b.WriteString(" text")
		}
		r.b.WriteByte('"')
		return
	}
	r.b.WriteString(`style="stroke-width:`)
	r.int(int(s.StrokeWidth))
	r.b.WriteString(";stroke:")
	if !s.StrokeColor.IsZero() {
		r.color(s.StrokeColor)
	} else {
		r.b.WriteString("none")
	}
	r.b.WriteString(";fill:")
	switch {
	case !s.FontColor.IsZero():
		r.color(s.FontColor)
	case !s.FillColor.IsZero():
		r.color(s.FillColor)
	default:
		r.b.WriteString("none")
	}
	if s.FontSize != 0 {
		r.b.WriteString(";font-size:")
		r.b.Write(strconv.AppendFloat(r.b.AvailableBuffer(), drawing.PointsToPixels(r.dpi, s.FontSize), 'f', 1, 64))
		r.b.WriteString("px")
	}
	if s.Font != nil {
		r.b.WriteString(";font-family:")
		if name := s.Font.Name(truetype.NameIDFontFamily); name != "" {
			r.b.WriteString("'" + name + "',")
		}
		r.b.WriteString("sans-serif")
	}
	r.b.WriteByte('"')
}

// color writes c as drawing.Color's String does: rgba(r,g,b,a) with a from
// 0 to 1 to one decimal.
func (r *svgWriter) color(c drawing.Color) {
	buf := r.b.AvailableBuffer()
	buf = append(buf, "rgba("...)
	buf = strconv.AppendUint(buf, uint64(c.R), 10)
	buf = append(buf, ',')
	buf = strconv.AppendUint(buf, uint64(c.G), 10)
	buf = append(buf, ',')
	buf = strconv.AppendUint(buf, uint64(c.B), 10)
	buf = append(buf, ',')
	buf = strconv.AppendFloat(buf, float64(c.A)/255, 'f', 1, 64)
	buf = append(buf, ')')
	r.b.Write(buf)
}

// MeasureText measures text as go-chart's renderer does, with the cached
// face.
func (r *svgWriter) MeasureText(body string) chart.Box {
	var box chart.Box
	if r.s.Font == nil {
		return box
	}
	box.Right = measureWith(faceKey{r.s.Font, r.s.FontSize, r.dpi}, body).Ceil()
	box.Bottom = int(drawing.PointsToPixels(r.dpi, r.s.FontSize))
	if r.theta == nil {
		return box
	}
	return box.Corners().Rotate(chart.RadiansToDegrees(*r.theta)).Box()
}
