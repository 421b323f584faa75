import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { AUTOSAVE_MS, OffsetForm } from './offset-form';

// A 20 cm collar: A = π·10² = 314.159 cm² (plain geometry). Chamber 4000 cm³ + loop 150 cm³.
const CONTEXT = {
  day: '2026-12-01',
  collarAreaCm2: Math.PI * 100,
  profiles: [{ validFrom: '2026-03-01', chamberVolumeCm3: 4000, loopVolumeCm3: 150 }],
  thresholds: { offsetSpreadPct: 3, offsetMoveCm: 1 },
};

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function render(previous: number[] | null = null, savedSet: number[] | null = null) {
  TestBed.configureTestingModule({ imports: [OffsetForm] });
  const fixture = TestBed.createComponent(OffsetForm);
  fixture.componentRef.setInput('context', CONTEXT);
  fixture.componentRef.setInput('previous', previous);
  fixture.componentRef.setInput('saved', savedSet);
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const saved: number[][] = [];
  fixture.componentInstance.save.subscribe((v) => saved.push(v));
  await fixture.whenStable();
  const enter = async (values: string[]) => {
    const inputs = await loader.getAllHarnesses(MatInputHarness.with({ selector: '[data-testid^="offset-"]' }));
    for (let i = 0; i < values.length; i++) await inputs[i].setValue(values[i]);
    await fixture.whenStable();
  };
  const text = (testId: string) =>
    (fixture.nativeElement as HTMLElement).querySelector(`[data-testid="${testId}"]`)?.textContent?.trim() ?? null;
  const warnings = () =>
    Array.from((fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid="offset-warning"]')).map((e) => e.textContent!.trim());
  return { fixture, loader, saved, enter, text, warnings };
}

describe('OffsetForm', () => {
  it('when four positions are level, then mean and sample SD are shown and no warning appears', async () => {
    const { enter, text, warnings } = await render();
    await enter(['2.0', '2.1', '1.9', '2,0']);
    // By hand: mean 2.000; SD = √((0 + 0.01 + 0.01 + 0) / 3) = 0.0816 cm (sample SD, n − 1).
    expect(text('offset-mean')).toBe('2.00 cm');
    expect(text('offset-sd')).toBe('0.08 cm');
    // SD·A = 25.65 cm³ of V = 4150 + 314.16·2.0 = 4778.3 cm³ → 0.5 %.
    expect(text('offset-spread')).toBe('0.5 % of volume');
    expect(warnings()).toEqual([]);
  });

  it('when one position is out of tolerance, then the spread warning names the share and the position is marked', async () => {
    const { fixture, enter, text, warnings } = await render();
    await enter(['2.0', '2.1', '1.9', '5.0']);
    // By hand: mean 2.75; deviations −0.75, −0.65, −0.85, 2.25; SS = 6.77; SD = √(6.77/3) = 1.502 cm.
    // SD·A = 471.9 cm³; V = 4150 + 314.16·2.75 = 5013.9 cm³ → 9.4 %, above the 3 % of common practice.
    expect(text('offset-mean')).toBe('2.75 cm');
    expect(text('offset-sd')).toBe('1.50 cm');
    expect(text('offset-spread')).toBe('9.4 % of volume');
    expect(warnings()).toHaveLength(1);
    expect(warnings()[0]).toContain('9.4 % of the headspace volume (limit 3.0 %)');
    const fields = (fixture.nativeElement as HTMLElement).querySelectorAll('.position');
    expect(Array.from(fields).map((f) => f.classList.contains('outlier'))).toEqual([false, false, false, true]);
  });

  it('when the mean moved more than the site limit since the last set, then a second warning says by how much', async () => {
    const { enter, text, warnings } = await render([1.0, 1.0, 1.0, 1.0]);
    await enter(['2.0', '2.1', '1.9', '2.0']);
    expect(text('offset-moved')).toBe('1.00 cm');
    expect(warnings()).toEqual([]);
    await enter(['2.2', '2.3', '2.1', '2.2']);
    expect(text('offset-moved')).toBe('1.20 cm');
    expect(warnings()).toEqual(['The mean moved +1.20 cm since the last set (limit 1.00 cm). Was the collar disturbed?']);
  });

  it('when the last set is known, then each position shows its previous value beside it', async () => {
    const { loader } = await render([1.4, 1.6, 1.5, 1.7]);
    const inputs = await loader.getAllHarnesses(MatInputHarness.with({ selector: '[data-testid^="offset-"]' }));
    expect(inputs).toHaveLength(4);
    const hints = Array.from(document.querySelectorAll('mat-hint')).map((h) => h.textContent?.trim());
    expect(hints).toEqual(['last 1.4', 'last 1.6', 'last 1.5', 'last 1.7']);
  });

  it('when Enter is pressed in a position, then the next position gets the focus, and on the last one the set is saved', async () => {
    const { fixture, saved, enter } = await render();
    await enter(['2.0', '2.1', '1.9', '2.0']);
    const boxes = (fixture.nativeElement as HTMLElement).querySelectorAll<HTMLInputElement>('input');
    boxes[0].focus();
    boxes[0].dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    expect(document.activeElement).toBe(boxes[1]);
    boxes[3].dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    expect(saved).toEqual([[2.0, 2.1, 1.9, 2.0]]);
  });

  it('when a box takes focus, then the whole set is brought into view at once (so Enter to the next box does not scroll the page)', async () => {
    const { fixture } = await render();
    const shown = jest.spyOn(Element.prototype, 'scrollIntoView');
    try {
      const boxes = (fixture.nativeElement as HTMLElement).querySelectorAll<HTMLInputElement>('[data-testid^="offset-"]');
      boxes[0].focus();
      const blocks = shown.mock.contexts as Element[];
      expect(blocks.map((el) => [el.classList.contains('positions'), el.contains(boxes[3])])).toEqual([[true, true]]);
      expect(shown.mock.calls).toEqual([[{ block: 'nearest' }]]);
    } finally {
      shown.mockRestore();
    }
  });

  it('when a position is empty, then saving is refused and names it; positions stay between 3 and 8', async () => {
    const { fixture, loader, saved, enter } = await render();
    await enter(['2.0', '', '1.9', '2.0']);
    const boxes = (fixture.nativeElement as HTMLElement).querySelectorAll<HTMLInputElement>('input');
    boxes[3].dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    await pause(AUTOSAVE_MS + 100);
    expect(saved).toEqual([]);
    fixture.detectChanges();
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Read position 2 first');
    const fewer = await loader.getHarness(MatButtonHarness.with({ text: 'Fewer positions' }));
    await fewer.click();
    expect(await fewer.isDisabled()).toBe(true);
    const more = await loader.getHarness(MatButtonHarness.with({ text: 'More positions' }));
    for (let i = 0; i < 6; i++) await more.click();
    expect(await loader.getAllHarnesses(MatInputHarness)).toHaveLength(8);
    expect(await more.isDisabled()).toBe(true);
  });

  it('when a full set is typed and the crew pauses, then it saves itself once, and the saved values stay in view', async () => {
    const { fixture, saved, enter, text } = await render();
    await enter(['2.0', '2.1', '1.9', '2.0']);
    expect(saved).toEqual([]);
    await pause(AUTOSAVE_MS + 150);
    expect(saved).toEqual([[2.0, 2.1, 1.9, 2.0]]);
    // The page hands the stored set back: the section folds to what it holds.
    fixture.componentRef.setInput('saved', [2.0, 2.1, 1.9, 2.0]);
    await fixture.whenStable();
    expect(text('offset-saved')).toMatch(/^Saved: 2\.0 · 2\.1 · 1\.9 · 2\.0 cm \(mean 2\.00\)\s*Change$/);
    await pause(AUTOSAVE_MS + 150);
    expect(saved).toHaveLength(1);
  });

  it('when the visit is opened again, then the boxes hold the saved set (not empty), and Change opens them', async () => {
    const { fixture, loader, text } = await render([1.0, 1.0, 1.0, 1.0], [1.5, 1.6, 1.7, 1.8]);
    expect(text('offset-saved')).toContain('Saved: 1.5 · 1.6 · 1.7 · 1.8 cm');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change' }))).click();
    const inputs = await loader.getAllHarnesses(MatInputHarness.with({ selector: '[data-testid^="offset-"]' }));
    expect(await Promise.all(inputs.map((i) => i.getValue()))).toEqual(['1.5', '1.6', '1.7', '1.8']);
    expect(fixture.nativeElement.textContent).not.toContain('both are kept');
  });

  it('when the rim has not moved, then "Same as last" saves the last set in one tap', async () => {
    const { loader, saved } = await render([1.4, 1.6, 1.5, 1.7]);
    await (await loader.getHarness(MatButtonHarness.with({ text: /^Same as last: 1\.4 · 1\.6 · 1\.5 · 1\.7 cm$/ }))).click();
    expect(saved).toEqual([[1.4, 1.6, 1.5, 1.7]]);
  });

  it('when a position moved a little, then ± steps of 0.1 cm start from the last set and the set saves itself', async () => {
    const { loader, saved } = await render([1.4, 1.6, 1.5, 1.7]);
    const plus = (n: number) => loader.getHarness(MatButtonHarness.with({ selector: `[aria-label="Position ${n} plus 0.1 cm"]` }));
    const minus = (n: number) => loader.getHarness(MatButtonHarness.with({ selector: `[aria-label="Position ${n} minus 0.1 cm"]` }));
    await (await plus(1)).click();
    await (await plus(1)).click();
    await (await minus(2)).click();
    await (await plus(3)).click();
    await (await minus(4)).click();
    await pause(AUTOSAVE_MS + 150);
    // 1.4 + 0.2, 1.6 − 0.1, 1.5 + 0.1, 1.7 − 0.1 (no floating-point tails: 1.6, not 1.5999…).
    expect(saved).toEqual([[1.6, 1.5, 1.6, 1.6]]);
  });
});
