/**
 * A generous estimate of the width in pixels of a line of text in the report's system sans-serif font,
 * for sizing SVG boxes without a layout engine: 0.6 em per character (0.66 em bold). Common practice for
 * proportional sans-serif faces, whose average Latin glyph is about 0.5–0.55 em; the margin keeps a box
 * from clipping its text on any of the fonts the style sheet lists. Checked in the browser test, which
 * measures every SVG text box in the page against its drawing.
 */
export function estimateTextWidth(text: string, fontSizePx: number, bold = false): number {
  return Math.ceil([...text].length * fontSizePx * (bold ? 0.66 : 0.6));
}
