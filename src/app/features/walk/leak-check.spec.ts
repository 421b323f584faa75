// Closure capture reads files in a module Web Worker (import.meta, not loadable under CommonJS
// jest): here the same parser runs in the test's thread.
jest.mock('../closures/logger-reader', () => ({
  readLoggerFile: (text: string, mapping: unknown, progress: (f: number) => void) =>
    Promise.resolve(jest.requireActual('../closures/logger-parse').parseLoggerText(text, mapping, progress)),
}));
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { LeakCheck, type LeakResult } from './leak-check';
import { leakFromTyped, leakSlope } from './leak-fit';

// Ordinary least squares slope b = Σ(t − t̄)(y − ȳ) / Σ(t − t̄)² (any statistics text, e.g. Draper &
// Smith 1998, Applied Regression Analysis, 3rd ed., Wiley, ch. 1), worked by hand below. Judging a
// sealed-plate closure by its CO2 drift against a limit is common practice.
describe('leakSlope', () => {
  it('when samples fall before the settle time, then only those at or after it are fitted', () => {
    // After 20 s: (20, 415.0) (30, 415.3) (40, 415.6) (50, 415.9), a straight line of 0.3 / 10 s = 0.03.
    const fit = leakSlope({ tS: [0, 10, 20, 30, 40, 50], co2Ppm: [430, 425, 415.0, 415.3, 415.6, 415.9] }, 20);
    expect(fit).toEqual({ ok: true, slopeUmolMolS: expect.closeTo(0.03, 12), n: 4, fromS: 20, toS: 50 });
  });

  it('when the series scatters, then the least-squares slope is the one worked by hand', () => {
    // τ 0 10 20 30, y 400 401 401 403: t̄ 15, ȳ 401.25; Sxy = 18.75 + 1.25 − 1.25 + 26.25 = 45; Sxx = 500 → 0.09.
    const fit = leakFromTyped('0 400\n10 401\n20 401\n30 403', 0);
    expect(fit.ok && fit.slopeUmolMolS).toBeCloseTo(0.09, 12);
  });

  it('when fewer than 3 samples remain after the settle time, then no slope is given and the crew is told why', () => {
    expect(leakSlope({ tS: [0, 10, 20, 30], co2Ppm: [415, 415, 415, 415] }, 25)).toEqual({
      ok: false,
      message: '1 sample after the 25 s settle time: at least 3 are needed.',
    });
    expect(leakFromTyped('0 415\n10 x', 0)).toEqual({ ok: false, message: 'Line 2: write seconds and CO2, e.g. "30 421.5"' });
  });
});

async function render(limit = 0.05) {
  TestBed.configureTestingModule({ imports: [LeakCheck] });
  const fixture = TestBed.createComponent(LeakCheck);
  fixture.componentRef.setInput('limit', limit);
  fixture.componentRef.setInput('settleDefault', 20);
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const saved: LeakResult[] = [];
  fixture.componentInstance.save.subscribe((v) => saved.push(v));
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const text = (id: string) => el.querySelector(`[data-testid="${id}"]`)?.textContent?.trim() ?? null;
  const input = (id: string) => loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }));
  const saveButton = () => loader.getHarness(MatButtonHarness.with({ text: 'Save leak check' }));
  return { fixture, loader, saved, el, text, input, saveButton };
}

describe('LeakCheck', () => {
  it('when the sealed-plate series is typed, then the fitted slope and verdict show and the check is saved with them', async () => {
    const { saved, text, input, saveButton } = await render();
    await (await input('leak-series')).setValue('0 430\n10 425\n20 415.0\n30 415.3\n40 415.6\n50 415.9');
    expect(text('leak-fitted')).toBe('Slope 0.0300 µmol/mol/s: linear fit of 4 samples, 20–50 s');
    expect(text('leak-verdict')).toBe('Passes');
    await (await saveButton()).click();
    expect(saved).toEqual([
      {
        slopeUmolMolS: expect.closeTo(0.03, 12),
        passed: true,
        note: 'Linear fit of 4 samples from 20 s to 50 s after a 20 s settle time (series typed by hand)',
        file: null,
      },
    ]);
  });

  it('when the settle time is shortened, then the early samples count and a fast drift fails the site limit', async () => {
    const { saved, text, input, saveButton } = await render();
    await (await input('leak-series')).setValue('0 400\n10 401\n20 401\n30 403');
    await (await input('leak-settle')).setValue('0');
    expect(text('leak-fitted')).toBe('Slope 0.0900 µmol/mol/s: linear fit of 4 samples, 0–30 s');
    expect(text('leak-verdict')).toBe('Fails: check seals and tubing, then repeat');
    await (await saveButton()).click();
    expect(saved[0]).toMatchObject({ slopeUmolMolS: expect.closeTo(0.09, 12), passed: false });
  });

  it('when a logger file holds two closures, then the chosen piece is fitted and named in the check', async () => {
    const { fixture, loader, saved, el, text, saveButton } = await render();
    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Logger file' });
    // Our plain export, elapsed time restarting at 0 for each closure (shared/logger/README.md).
    const csv = 'time_s,co2_ppm\n0,500\n20,501\n30,502\n40,503\n0,420\n20,420\n30,420.2\n40,420.4\n50,420.6\n';
    const fileInput = el.querySelector<HTMLInputElement>('[data-testid="leak-file"]')!;
    // jsdom's File has no text(): the same shape the browser gives, by hand.
    const file = { name: 'plate.csv', size: csv.length, text: async () => csv };
    Object.defineProperty(fileInput, 'files', { value: [file] });
    fileInput.dispatchEvent(new Event('change'));
    await new Promise((r) => setTimeout(r, 50));
    await fixture.whenStable();
    // Piece 1 after 20 s: (20, 501) (30, 502) (40, 503) → 0.1 per s, over the limit.
    expect(text('leak-fitted')).toBe('Slope 0.1000 µmol/mol/s: linear fit of 3 samples, 20–40 s');
    expect(text('leak-verdict')).toBe('Fails: check seals and tubing, then repeat');
    const piece = await loader.getHarness(MatSelectHarness.with({ selector: 'mat-select' }));
    await piece.open();
    const labels = await Promise.all((await piece.getOptions()).map((o) => o.getText()));
    expect(labels).toEqual(['Piece 1: lines 2–5, 4 samples', 'Piece 2: lines 6–10, 5 samples']);
    await piece.clickOptions({ text: 'Piece 2: lines 6–10, 5 samples' });
    // Piece 2 after 20 s: 420, 420.2, 420.4, 420.6 every 10 s → 0.02 per s.
    expect(text('leak-fitted')).toBe('Slope 0.0200 µmol/mol/s: linear fit of 4 samples, 20–50 s');
    await (await saveButton()).click();
    expect(saved).toEqual([
      {
        slopeUmolMolS: expect.closeTo(0.02, 12),
        passed: true,
        note: 'Linear fit of 4 samples from 20 s to 50 s after a 20 s settle time (plate.csv, Piece 2: lines 6–10, 5 samples)',
        file,
      },
    ]);
  });

  it('when only a slope is typed, then it is saved only with a reason, and the note says it was typed', async () => {
    const { loader, saved, text, input, saveButton, el } = await render();
    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Type the slope only' });
    await (await input('leak-slope')).setValue('-0.02');
    expect(text('leak-verdict')).toBe('Passes');
    await (await saveButton()).click();
    expect(saved).toEqual([]);
    expect(el.querySelector('[role="alert"]')?.textContent?.trim()).toBe(
      'Say why the slope is typed instead of the closure (the lead sees it).',
    );
    await (await input('leak-reason')).setValue('Phone battery flat at the plate');
    await (await saveButton()).click();
    expect(saved).toEqual([
      { slopeUmolMolS: -0.02, passed: true, note: 'Slope typed from the analyzer: Phone battery flat at the plate', file: null },
    ]);
  });
});
