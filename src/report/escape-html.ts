const REPLACEMENTS: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escapes text for HTML and SVG text content and for quoted attribute values: `&`, `<`, `>`, `"` and `'`
 * become character references (HTML Living Standard, "Serializing HTML fragments", escaping a string).
 * Every piece of text that comes from an input file goes through here before it reaches the report.
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => REPLACEMENTS[c]);
}
