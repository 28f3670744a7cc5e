package tcc

import (
	"sync"

	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// outlined is a canvas that draws every text as the filled outlines of its
// glyphs instead of handing the string to the format. A PNG and an SVG of
// a chart then carry the same shapes, and an SVG shows the same picture on
// a machine that lacks our typeface (a viewer substitutes another font for
// an SVG <text>, with other widths, and clips or overlaps what was laid
// out for ours). Glyph advances and kerning are those gonum/plot's
// font.Face.Width measures with, so every text box the layout computed is
// the box of the ink drawn.
type outlined struct {
	vg.CanvasSizer
	// ink, when set, records the box of every text drawn (tests read it).
	ink *inkRecorder
}

var _ vg.CanvasSizer = outlined{}

// inkRecorder keeps the box of every text drawn in page coordinates: its
// advance width from the pen position, and the font's ascent and descent
// about the baseline. Texts drawn rotated (the time axis's name) are
// counted but not boxed.
type inkRecorder struct {
	boxes   []inkBox
	rotated int
	stack   []int
}

// inkBox is the box of one drawn text.
type inkBox struct {
	text string
	box  vg.Rectangle
}

// Rotate rotates the canvas and notes it.
func (c outlined) Rotate(rad float64) {
	if c.ink != nil && rad != 0 {
		c.ink.rotated++
	}
	c.CanvasSizer.Rotate(rad)
}

// Push saves the canvas state.
func (c outlined) Push() {
	if c.ink != nil {
		c.ink.stack = append(c.ink.stack, c.ink.rotated)
	}
	c.CanvasSizer.Push()
}

// Pop restores the state Push saved.
func (c outlined) Pop() {
	if c.ink != nil && len(c.ink.stack) > 0 {
		c.ink.rotated = c.ink.stack[len(c.ink.stack)-1]
		c.ink.stack = c.ink.stack[:len(c.ink.stack)-1]
	}
	c.CanvasSizer.Pop()
}

// FillString draws str with its baseline starting at pt.
func (c outlined) FillString(f font.Face, pt vg.Point, str string) {
	if f.Font.Size <= 0 || str == "" {
		return
	}
	p, w := glyphPath(f, pt, str)
	if len(p) > 0 {
		c.CanvasSizer.Fill(p)
	}
	if c.ink != nil && c.ink.rotated == 0 {
		ext := f.Extents()
		c.ink.boxes = append(c.ink.boxes, inkBox{text: str, box: vg.Rectangle{
			Min: vg.Point{X: pt.X, Y: pt.Y - ext.Descent},
			Max: vg.Point{X: pt.X + w, Y: pt.Y + ext.Ascent},
		}})
	}
}

// glyphKey names one glyph of one font file.
type glyphKey struct {
	face *sfnt.Font
	idx  sfnt.GlyphIndex
}

// glyphCache keeps glyph outlines in font units (y up), since every chart
// draws the same few dozen glyphs thousands of times.
var glyphCache sync.Map // glyphKey → []sfnt.Segment

// outline returns glyph idx of face in font units, y up.
func outline(face *sfnt.Font, idx sfnt.GlyphIndex) []sfnt.Segment {
	key := glyphKey{face, idx}
	if s, ok := glyphCache.Load(key); ok {
		return s.([]sfnt.Segment)
	}
	var buf sfnt.Buffer
	// With ppem equal to the units per em, the 26.6 coordinates LoadGlyph
	// returns are font units (the scaling gonum/plot's Face.Width uses).
	segs, err := face.LoadGlyph(&buf, idx, fixed.Int26_6(face.UnitsPerEm()), nil)
	if err != nil {
		segs = nil // a glyph that cannot be read is drawn as nothing
	}
	out := make([]sfnt.Segment, len(segs))
	for k, s := range segs {
		for a := range s.Args {
			s.Args[a].Y = -s.Args[a].Y
		}
		out[k] = s
	}
	glyphCache.Store(key, out)
	return out
}

// glyphPath returns the outlines of str set in face f with its baseline
// starting at pt, and the string's advance width.
func glyphPath(f font.Face, pt vg.Point, str string) (vg.Path, vg.Length) {
	face := f.Face
	upem := float64(face.UnitsPerEm())
	scale := f.Font.Size.Points() / upem
	at := func(p fixed.Point26_6, penX float64) vg.Point {
		return vg.Point{
			X: pt.X + vg.Points((penX+float64(p.X))*scale),
			Y: pt.Y + vg.Points(float64(p.Y)*scale),
		}
	}
	var (
		path    vg.Path
		buf     sfnt.Buffer
		pen     float64 // in font units
		prev    sfnt.GlyphIndex
		hasPrev bool
	)
	ppem := fixed.Int26_6(face.UnitsPerEm())
	for _, r := range str {
		idx, err := face.GlyphIndex(&buf, r)
		if err != nil {
			idx = 0
		}
		if hasPrev {
			// A pair the font does not kern (sfnt.ErrNotFound) adds nothing.
			if k, err := face.Kern(&buf, prev, idx, ppem, 0); err == nil {
				pen += float64(k)
			}
		}
		open := false
		for _, s := range outline(face, idx) {
			switch s.Op {
			case sfnt.SegmentOpMoveTo:
				if open {
					path.Close()
				}
				path.Move(at(s.Args[0], pen))
				open = true
			case sfnt.SegmentOpLineTo:
				path.Line(at(s.Args[0], pen))
			case sfnt.SegmentOpQuadTo:
				path.QuadTo(at(s.Args[0], pen), at(s.Args[1], pen))
			case sfnt.SegmentOpCubeTo:
				path.CubeTo(at(s.Args[0], pen), at(s.Args[1], pen), at(s.Args[2], pen))
			}
		}
		if open {
			path.Close()
		}
		if adv, err := face.GlyphAdvance(&buf, idx, ppem, 0); err == nil {
			pen += float64(adv)
		}
		prev, hasPrev = idx, true
	}
	return path, vg.Points(pen * scale)
}
