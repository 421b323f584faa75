/**
 * Leaflet writes string content (tooltips, popups, divIcon `html`, attribution) into the page as
 * HTML. Codes, names and notes are typed by people, so they reach a map only as text: as an element
 * whose textContent holds them (tooltips, popups, icons), or escaped where Leaflet takes nothing
 * but a string (a tile layer's attribution).
 */
export function mapText(text: string, className?: string): HTMLSpanElement {
  const el = document.createElement('span');
  if (className) el.className = className;
  el.textContent = text;
  return el;
}

/** For the few Leaflet options that accept only an HTML string. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
