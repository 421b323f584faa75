import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { escapeHtml, mapText } from './map-text';

const APP = join(__dirname, '..', '..');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === 'testing' ? [] : sources(path);
    return /\.(ts|html)$/.test(name) && !name.endsWith('.spec.ts') ? [path] : [];
  });
}

/** Places that turn a string into markup. Each must take record text only through mapText/escapeHtml. */
const SINKS: [RegExp, string][] = [
  [/\b(bindTooltip|bindPopup|setContent|setTooltipContent|setPopupContent)\((?!mapText\()/, 'Leaflet content must be mapText(…)'],
  [/\bhtml:\s*[`'"]/, 'a divIcon takes an element built with mapText, not an HTML string'],
  [/\battribution:(?!\s*escapeHtml\()/, 'a tile attribution is escaped with escapeHtml'],
  [/innerHTML|outerHTML|insertAdjacentHTML|document\.write/, 'no HTML strings into the page'],
  [/bypassSecurityTrust/, "no bypass of Angular's sanitizer"],
];

/** Markup that holds no record text: our own constant SVG shapes for the Board map's legend. */
const ALLOWED = new Set([
  'features/board/board-map.ts: no HTML strings into the page',
  "features/board/board-map.ts: no bypass of Angular's sanitizer",
]);

describe('Record text reaches the page as text', () => {
  it('when a code holds HTML, then mapText keeps it as the text of one span', () => {
    const el = mapText('<img src=x onerror=alert(1)>', 'fw-collar-label');
    expect(el.textContent).toBe('<img src=x onerror=alert(1)>');
    expect(el.children).toHaveLength(0);
    expect(el.className).toBe('fw-collar-label');
    expect(escapeHtml('<b a="1">&\'')).toBe('&#60;b a=&#34;1&#34;&#62;&#38;&#39;');
  });

  it('when the app sources are read, then every map label, popup, icon and attribution goes through mapText/escapeHtml and nothing else writes HTML', () => {
    const found: string[] = [];
    for (const file of sources(APP)) {
      const rel = relative(APP, file);
      readFileSync(file, 'utf8')
        .split('\n')
        .forEach((line, i) => {
          for (const [re, rule] of SINKS) if (re.test(line) && !ALLOWED.has(`${rel}: ${rule}`)) found.push(`${rel}:${i + 1} ${rule}`);
        });
    }
    expect(found).toEqual([]);
  });
});
