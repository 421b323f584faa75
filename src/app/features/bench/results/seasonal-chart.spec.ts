import { TestBed } from '@angular/core/testing';
import { SeasonalChart } from './seasonal-chart';
import { SEASONAL } from './testing/results-fixtures';

async function render() {
  TestBed.configureTestingModule({ imports: [SeasonalChart] });
  const fixture = TestBed.createComponent(SeasonalChart);
  fixture.componentRef.setInput('data', SEASONAL);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const rows = Array.from(el.querySelectorAll('[data-testid="seasonal-table"] tbody tr')).map((r) =>
    Array.from(r.children).map((c) => c.textContent!.replace(/\s+/g, ' ').trim()),
  );
  return { el, rows };
}

describe('SeasonalChart', () => {
  it('when totals arrive, then each treatment shows its total, t interval, plots totalled, its plot-days and the share outside the fitted range', async () => {
    const { rows } = await render();
    expect(rows).toEqual([
      ['CTRL', '412', '380–446', '2 of 3', '165 / 17 / 0', '2% (fitted 4.0–16.0 °C)'],
      ['1 of 3 plots have too little signal and are not totalled: P3'],
      // A total with missing days is never shown as a (smaller) number.
      ['TRENCH (collar)', 'incomplete: missing days', '—', '0 of 1', '0 / 80 / 11', '0%'],
      ['missing days at P9: no total for 2026-04-01 to 2026-06-30; every plot has a value from 2026-04-01 to 2026-06-19'],
    ]);
  });

  it('when plots are listed, then each shows its days, the logger depth beside the response depth, and its notes', async () => {
    const { el } = await render();
    const rows = Array.from(el.querySelectorAll('[data-testid="seasonal-plots"] tbody tr')).map((r) =>
      Array.from(r.children).map((c) => c.textContent!.replace(/\s+/g, ' ').trim()),
    );
    expect(rows[0]).toEqual([
      'CTRL',
      'P1',
      '400',
      '80 / 11 / 0',
      '5 cm / 5 cm',
      'interpolated days use means of daytime visits (6–18 h) as daily means: diel bias',
    ]);
    expect(rows[1].slice(0, 5)).toEqual(['CTRL', 'P2', '425', '85 / 6 / 0', '10 cm / 5 cm (differ)']);
    expect(rows[2].slice(0, 3)).toEqual(['CTRL', 'P3', 'too little signal']);
    expect(el.querySelector('[data-testid="seasonal-plots"] tbody tr:nth-child(2) td.differs')).not.toBeNull();
  });

  it('when drawn, then there is one cumulative line per treatment with a total, and the method and what the interval leaves out are stated', async () => {
    const { el } = await render();
    const lines = Array.from(el.querySelectorAll('[data-testid="seasonal-chart"] path'));
    expect(lines.map((l) => l.querySelector('title')!.textContent)).toEqual(['CTRL', 'TRENCH (collar)']);
    expect(lines[0].getAttribute('d')!.split('L')).toHaveLength(3);
    expect(lines[1].getAttribute('d')).toBe('');
    expect(el.querySelector('.method')!.textContent).toBe(`${SEASONAL.method} Response used: Lloyd & Taylor, fitted on the log scale.`);
    expect(el.querySelector('[data-testid="interval-note"]')!.textContent).toContain(
      'leaves out the uncertainty of the response parameters and of the gap filling',
    );
    expect(el.querySelector('caption')!.textContent).toBe('Seasonal totals 2026-04-01 – 2026-06-30');
    // Month ticks on the first of each month after the start.
    expect(
      Array.from(el.querySelectorAll('text.axis'))
        .map((t) => t.textContent)
        .filter((t) => /^[A-Z][a-z]{2}$/.test(t!)),
    ).toEqual(['Apr', 'May', 'Jun']);
  });
});
