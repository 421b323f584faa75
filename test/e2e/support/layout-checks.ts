/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import AxeBuilder from '@axe-core/playwright';
import { Page } from 'playwright-core';

/** One thing the layout guard found on a screen: which check, and where (a short element description). */
export interface LayoutFinding {
  check:
    'header' | 'page-wider-than-screen' | 'cut-off' | 'covered' | 'text-overflow' | 'default-look' | 'small-target' | 'tab-arrows' | 'axe';
  where: string;
}

/**
 * Material's own controls render a <button> or <input> carrying these classes; any other button
 * is the browser's default look. Named one by one so a new kind of control has to be looked at.
 */
const MATERIAL_BUTTONS = [
  '.mat-mdc-button-base', // mat-button, mat-flat-button, mat-stroked-button, mat-raised-button, mat-icon-button, mat-fab
  '.mat-mdc-list-item', // a list item that is a button
  '.mat-mdc-menu-item',
  '.mat-button-toggle-button',
  '.mdc-switch', // mat-slide-toggle
  '.mat-mdc-chip-action',
  '.mat-mdc-tab-header-pagination', // reported on its own as "tab-arrows"
  '.mat-calendar-body-cell',
  '.mat-expansion-panel-header',
  // Named exception: the sync state chip in the header (core/sync/sync-indicator.ts) is drawn by the
  // app in its own state colours and shape, not the browser's default look; it opens the sync sheet.
  '[data-testid="sync-indicator"]',
];
/** Native inputs Material wraps (checkbox, radio, slider) or hides behind a Material button (file). */
const MATERIAL_INPUTS = ['.mdc-checkbox__native-control', '.mdc-radio__native-control', '.mdc-slider__input', '[type=hidden]'];

/**
 * The layout checks of one screen, run in the page (it scrolls to look at each element):
 * - page-wider-than-screen: document.scrollingElement.scrollWidth > innerWidth;
 * - cut-off: visible text or a control whose box ends beyond the viewport's right edge with no
 *   scrolling box around it (the part beyond cannot be reached);
 * - covered: a form-field label, hint or error overlapping another field, control or text (a bar
 *   fixed to the window's edge counts only where no scroll position brings the words out from under it);
 * - text-overflow: a label, hint, error, button or tab label whose text is wider than its box, or a
 *   hint or error that runs out of its form field's box (below or beside it);
 * - default-look: a button, select, progress bar, disclosure or text input the browser draws itself;
 * - small-target: a control smaller than `minTargetPx` square: 24×24 CSS px by default (WCAG 2.2,
 *   2.5.8 Target Size (Minimum), with its spacing exception), 48×48 on Walk screens (the product's
 *   rule for use with gloves, no spacing exception); inline links inside a sentence are the
 *   criterion's own exception at either size;
 * - tab-arrows: tabs hidden behind Material's pagination arrows.
 */
export async function layoutFindings(page: Page, { minTargetPx = 24 }: { minTargetPx?: number } = {}): Promise<LayoutFinding[]> {
  return page.evaluate(
    ({ materialButtons, materialInputs, minTarget }) => {
      const found: { check: string; where: string }[] = [];
      const describe = (el: Element) => {
        // The app component that drew it, so a finding names its owner (fw-bench > button "Results").
        let owner = el.parentElement;
        while (owner && !owner.tagName.startsWith('FW-')) owner = owner.parentElement;
        const text = (el.getAttribute('aria-label') || (el as HTMLElement).innerText || el.getAttribute('name') || '')
          .trim()
          .replace(/\s+/g, ' ')
          .slice(0, 40);
        const cls = typeof el.className === 'string' && el.className ? `.${el.className.trim().split(/\s+/).slice(0, 2).join('.')}` : '';
        return `${owner ? `${owner.tagName.toLowerCase()} > ` : ''}${el.tagName.toLowerCase()}${cls}${text ? ` "${text}"` : ''}`;
      };
      const visible = (el: Element) => {
        const r = el.getBoundingClientRect();
        if (r.width <= 1 || r.height <= 1) return false;
        const s = getComputedStyle(el);
        return (
          s.visibility !== 'hidden' &&
          s.display !== 'none' &&
          Number(s.opacity) > 0 &&
          !el.closest('[aria-hidden="true"], .cdk-visually-hidden, [inert]')
        );
      };
      const scrollsX = (el: Element | null): boolean => {
        for (let p = el?.parentElement ?? null; p && p !== document.body; p = p.parentElement) {
          const o = getComputedStyle(p).overflowX;
          if (o === 'auto' || o === 'scroll') return true;
        }
        return false;
      };
      /** The part of an element's box that shows: cut to every ancestor that clips or scrolls. */
      const shownRect = (el: Element) => {
        const r = el.getBoundingClientRect();
        let { left, top, right, bottom } = r;
        for (let p = el.parentElement; p && p !== document.body; p = p.parentElement) {
          const st = getComputedStyle(p);
          if (st.overflowX === 'visible' && st.overflowY === 'visible') continue;
          const q = p.getBoundingClientRect();
          left = Math.max(left, q.left);
          top = Math.max(top, q.top);
          right = Math.min(right, q.right);
          bottom = Math.min(bottom, q.bottom);
        }
        return { left, top, right, bottom };
      };
      const inMap = (el: Element) => !!el.closest('.leaflet-container, canvas, svg');

      const doc = document.scrollingElement ?? document.documentElement;
      if (doc.scrollWidth > innerWidth)
        found.push({ check: 'page-wider-than-screen', where: `${doc.scrollWidth} px in a ${innerWidth} px window` });

      // Leaf text and controls past the right edge, not inside a box that scrolls sideways.
      const leaves = Array.from(document.querySelectorAll('body *')).filter(
        (el) =>
          !inMap(el) &&
          (el.matches('button, a, input, select, textarea, [role=tab], th, td') ||
            Array.from(el.childNodes).some((n) => n.nodeType === Node.TEXT_NODE && n.textContent!.trim())),
      );
      for (const el of leaves) {
        if (!visible(el)) continue;
        const r = el.getBoundingClientRect();
        if (r.right > innerWidth + 1 && !scrollsX(el))
          found.push({ check: 'cut-off', where: `${describe(el)} ends at ${Math.round(r.right)} px` });
      }

      for (const el of Array.from(document.querySelectorAll('.mat-mdc-tab-header-pagination'))) {
        if (visible(el) && !el.classList.contains('mat-mdc-tab-header-pagination-disabled')) {
          found.push({ check: 'tab-arrows', where: describe(el.closest('.mat-mdc-tab-header')?.parentElement ?? el) });
          break;
        }
      }

      const words =
        '.mdc-floating-label, mat-label, mat-hint, mat-error, .mdc-button__label, .mdc-tab__text-label, .mdc-list-item__primary-text';
      for (const el of Array.from(document.querySelectorAll(words))) {
        if (!visible(el) || inMap(el)) continue;
        const h = el as HTMLElement;
        if (h.scrollWidth > h.clientWidth + 1 && getComputedStyle(h).overflowX !== 'visible') {
          found.push({ check: 'text-overflow', where: describe(h) });
        }
      }

      // A hint or error longer than the room its field keeps for it (a fixed one-line subscript) runs
      // out of the field's box, over whatever follows.
      for (const el of Array.from(document.querySelectorAll('.mat-mdc-form-field mat-hint, .mat-mdc-form-field mat-error'))) {
        if (!visible(el) || inMap(el)) continue;
        const r = el.getBoundingClientRect(),
          q = el.closest('.mat-mdc-form-field')!.getBoundingClientRect();
        if (r.bottom > q.bottom + 1 || r.right > q.right + 1)
          found.push({ check: 'text-overflow', where: `${describe(el)} runs out of its field's box` });
      }

      // A field's label, hint or error overlapping another field, control or text box.
      const fieldWords = Array.from(
        document.querySelectorAll('.mat-mdc-form-field .mdc-floating-label, .mat-mdc-form-field mat-hint, .mat-mdc-form-field mat-error'),
      ).filter(visible);
      const others = Array.from(
        document.querySelectorAll(
          '.mat-mdc-text-field-wrapper, button, a[href], input:not([type=hidden]), textarea, mat-select, p, h1, h2, h3, label, li, th, td',
        ),
      ).filter((o) => visible(o) && !inMap(o));
      /** A bar fixed or stuck to the window's top or bottom edge that the page scrolls under (the header, Walk's chamber bar). */
      const pinnedBar = (el: Element): Element | null => {
        for (let p: Element | null = el; p && p !== document.body; p = p.parentElement) {
          const pos = getComputedStyle(p).position;
          if (pos === 'fixed' || pos === 'sticky') return p;
        }
        return null;
      };
      /** Whether some scroll position shows `r` (a box in window coordinates) clear of the bar `q`. */
      const scrollsClear = (r: DOMRect, q: DOMRect) => {
        const maxY = doc.scrollHeight - innerHeight;
        return q.top > innerHeight / 2
          ? r.bottom + scrollY <= maxY + q.top + 1 // under a bottom bar: the page's end leaves room above it
          : r.top + scrollY >= q.bottom - 1; // under a top bar (at the page's top): scrolled to the top, it shows below the bar
      };
      for (const el of fieldWords) {
        const r = shownRect(el);
        const own = el.closest('.mat-mdc-form-field')!;
        const ownBar = pinnedBar(el);
        for (const o of others) {
          if (own.contains(o) || o.contains(el)) continue;
          const bar = pinnedBar(o);
          if (bar && bar !== ownBar && scrollsClear(el.getBoundingClientRect(), bar.getBoundingClientRect())) continue;
          const q = shownRect(o);
          const w = Math.min(r.right, q.right) - Math.max(r.left, q.left),
            h = Math.min(r.bottom, q.bottom) - Math.max(r.top, q.top);
          if (w > 2 && h > 2) {
            found.push({ check: 'covered', where: `${describe(el)} under ${describe(o)}` });
            break;
          }
        }
      }

      const plain = [
        `button:not(${materialButtons.join(', ')})`,
        'input[type=button], input[type=submit], input[type=reset]',
        'select',
        'progress',
        'summary',
        `input:not(${materialInputs.join(', ')}):not(.mat-mdc-form-field input)`,
        'textarea:not(.mat-mdc-form-field textarea)',
      ].join(', ');
      for (const el of Array.from(document.querySelectorAll(plain))) {
        if (visible(el) && !inMap(el)) found.push({ check: 'default-look', where: describe(el) });
      }

      const targets =
        'a[href], button, input:not([type=hidden]), select, textarea, [role=button], [role=tab], [role=link], [role=checkbox], [role=radio], mat-select';
      const allTargets = Array.from(document.querySelectorAll(targets)).filter(
        (el) => visible(el) && !inMap(el) && !el.closest('.mat-mdc-form-field'),
      );
      for (const el of allTargets) {
        const r = el.getBoundingClientRect();
        if (r.width >= minTarget - 0.5 && r.height >= minTarget - 0.5) continue;
        // WCAG 2.5.8 spacing exception (the 24 px rule only): a 24 px circle on the small target's centre meets no other target.
        const cx = r.left + r.width / 2,
          cy = r.top + r.height / 2;
        const near =
          minTarget > 24 ||
          allTargets.some((o) => {
            if (o === el || o.contains(el) || el.contains(o)) return false;
            const q = o.getBoundingClientRect();
            const dx = Math.max(q.left - cx, 0, cx - q.right),
              dy = Math.max(q.top - cy, 0, cy - q.bottom);
            return dx * dx + dy * dy < 12 * 12;
          });
        if (!near) continue;
        // WCAG 2.5.8 exception: a link inside a sentence.
        if (
          el.matches('a') &&
          getComputedStyle(el).display === 'inline' &&
          el.parentElement &&
          (el.parentElement.textContent ?? '').trim().length > (el.textContent ?? '').trim().length
        )
          continue;
        found.push({ check: 'small-target', where: `${describe(el)} ${Math.round(r.width)}×${Math.round(r.height)}` });
      }
      for (const f of Array.from(document.querySelectorAll('.mat-mdc-form-field .mat-mdc-text-field-wrapper'))) {
        if (!visible(f)) continue;
        const r = f.getBoundingClientRect();
        if (r.width < minTarget - 0.5 || r.height < minTarget - 0.5)
          found.push({
            check: 'small-target',
            where: `${describe(f.closest('.mat-mdc-form-field')!)} ${Math.round(r.width)}×${Math.round(r.height)}`,
          });
      }
      return found as { check: LayoutFinding['check']; where: string }[];
    },
    { materialButtons: MATERIAL_BUTTONS, materialInputs: MATERIAL_INPUTS, minTarget: minTargetPx },
  );
}

/** axe-core (WCAG 2.0–2.2 A/AA rules) on the page: every serious, critical or moderate violation. */
export async function axeFindings(page: Page): Promise<LayoutFinding[]> {
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical' || v.impact === 'moderate')
    .map((v) => ({
      check: 'axe' as const,
      where: `${v.id} (${v.impact}): ${v.nodes
        .slice(0, 3)
        .map((n) => n.target.join(' '))
        .join(' | ')}`,
    }));
}
