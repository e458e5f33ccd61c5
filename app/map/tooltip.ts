/**
 * Tooltip and label content built from DOM nodes. Leaflet inserts a string given to a tooltip,
 * popup, divIcon or attribution as HTML, so text that can come from a file or a field (site and
 * variant ids, names, attribution) is never handed over as a string: it goes in as text nodes.
 */

/** Lines of text as one element, the lines separated by <br>; nothing in them is parsed as HTML. */
export function tipNode(lines: readonly string[]): HTMLElement {
  const el = document.createElement('div');
  lines.forEach((line, i) => {
    if (i > 0) el.append(document.createElement('br'));
    el.append(document.createTextNode(line));
  });
  return el;
}

/** Tooltip content built only when Leaflet opens the tooltip, so thousands of layers stay cheap. */
export const lazyTip =
  (...lines: string[]): (() => HTMLElement) =>
  () =>
    tipNode(lines);

/** Text escaped for the few Leaflet APIs that take only an HTML string (the attribution control). */
export function escapeHtml(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c,
  );
}
