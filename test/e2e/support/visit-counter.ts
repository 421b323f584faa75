/// <reference lib="dom" />
// Callbacks passed to locator.evaluate() run in the browser and use its DOM types.
import type { Locator } from 'playwright-core';

export interface VisitCount {
  taps: number;
  typedFields: number;
  characters: number;
  scrolls: number;
  filePickers: number;
}

/**
 * Counts what a person does with a phone for one visit: taps, typed fields and their characters,
 * scrolls (a control that is not fully on screen, or is covered by something fixed over it, costs
 * one scroll before it can be reached) and the phone's file pickers.
 */
export class VisitCounter {
  readonly count: VisitCount = { taps: 0, typedFields: 0, characters: 0, scrolls: 0, filePickers: 0 };
  /** Controls that needed a scroll, by name, for the report. */
  readonly scrolledTo: string[] = [];

  private async reach(target: Locator, name: string): Promise<void> {
    await target.waitFor({ state: 'visible' });
    const onScreen = await target.evaluate((el) => {
      const r = el.getBoundingClientRect();
      if (r.top < 0 || r.left < 0 || r.bottom > window.innerHeight || r.right > window.innerWidth) return false;
      const hit = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
      if (!hit) return false;
      // A Material field's floating label or a checkbox's ripple lies over its input: same control.
      const control = (n: Element) => n.closest('mat-form-field, mat-checkbox, mat-radio-button, button, a');
      return el === hit || el.contains(hit) || hit.contains(el) || (!!control(el) && control(el) === control(hit));
    });
    if (onScreen) return;
    this.count.scrolls++;
    this.scrolledTo.push(name);
    await target.evaluate((el) => el.scrollIntoView({ block: 'center' }));
  }

  async tap(target: Locator, name: string): Promise<void> {
    await this.reach(target, name);
    this.count.taps++;
    await target.tap();
  }

  async type(target: Locator, text: string, name: string): Promise<void> {
    await this.reach(target, name);
    this.count.typedFields++;
    this.count.characters += text.length;
    await target.fill(text);
  }

  /** A tap on a file button and the phone's file picker. */
  async pickFile(target: Locator, file: { name: string; mimeType: string; buffer: Buffer }, name: string): Promise<void> {
    this.count.taps++;
    this.count.filePickers++;
    void name;
    await target.setInputFiles(file);
  }

  summary(): string {
    const c = this.count;
    return (
      `${c.taps} taps + ${c.typedFields} typed fields (${c.characters} characters) + ${c.scrolls} scrolls + ${c.filePickers} file picker` +
      (this.scrolledTo.length ? ` (scrolled to: ${this.scrolledTo.join(', ')})` : '')
    );
  }
}
