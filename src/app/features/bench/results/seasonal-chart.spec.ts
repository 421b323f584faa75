import { TestBed } from '@angular/core/testing';
import { SeasonalChart } from './seasonal-chart';
import { SEASONAL } from './testing/results-fixtures';

async function render() {
  TestBed.configureTestingModule({ imports: [SeasonalChart] });
  const fixture = TestBed.createComponent(SeasonalChart);
  fixture.componentRef.setInput('data', SEASONAL);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const rows = Array.from(el.querySelectorAll('[data-testid="seasonal-table"] tbody tr'))
    .map((r) => Array.from(r.children).map((c) => c.textContent!.replace(/\s+/g, ' ').trim()));
  return { el, rows };
}

describe('SeasonalChart', () => {
  it('when totals arrive, then each treatment shows its total, bootstrap interval, n plots and the days behind it', async () => {
    const { rows } = await render();
    expect(rows).toEqual([
      // Days summed over the plots: logged 80 + 85, interpolated 10 + 6, missing 1 + 0.
      ['CTRL', '412', '380–446', '4', '165 / 16 / 1'],
      ['TRENCH (collar)', '—', '—', '1', '0 / 0 / 0'],
    ]);
  });

  it('when drawn, then there is one cumulative line per treatment and the method and resamples are stated', async () => {
    const { el } = await render();
    const lines = Array.from(el.querySelectorAll('[data-testid="seasonal-chart"] path'));
    expect(lines.map((l) => l.querySelector('title')!.textContent)).toEqual(['CTRL', 'TRENCH (collar)']);
    expect(lines[0].getAttribute('d')!.split('L')).toHaveLength(3);
    expect(el.querySelector('.method')!.textContent).toBe(`${SEASONAL.method} Response used: lloyd-taylor; 2000 bootstrap resamples.`);
    expect(el.querySelector('caption')!.textContent).toBe('Seasonal totals 2026-04-01 – 2026-06-30');
    // Month ticks on the first of each month after the start.
    expect(Array.from(el.querySelectorAll('text.axis')).map((t) => t.textContent).filter((t) => /^[A-Z][a-z]{2}$/.test(t!))).toEqual(['Apr', 'May', 'Jun']);
  });
});
