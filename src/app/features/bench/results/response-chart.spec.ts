import { TestBed } from '@angular/core/testing';
import { ResponseChart } from './response-chart';
import { RESPONSES } from './testing/results-fixtures';

async function render() {
  TestBed.configureTestingModule({ imports: [ResponseChart] });
  const fixture = TestBed.createComponent(ResponseChart);
  fixture.componentRef.setInput('data', RESPONSES);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const rows = () =>
    Array.from(el.querySelectorAll('[data-testid="response-table"] tbody tr')).map((r) =>
      Array.from(r.children).map((c) => c.textContent!.replace(/\s+/g, ' ').trim()),
    );
  return { fixture, el, rows };
}

describe('ResponseChart', () => {
  it('when both fits succeed, then Q10, R10 and E0 are shown with their 95 % CI, the log-scale fits, units and plots, and the E0 warning', async () => {
    const { rows } = await render();
    expect(rows()[0]).toEqual([
      'CTRL',
      '3 (2)',
      '2.71 (2.20–3.30)',
      '2.02 (1.80–2.25)',
      '515 (450–581; published 308.56)',
      '2.05 (1.81–2.31)',
      '2.65 (2.10–3.20) ; not fitted',
      'only 2 plots (independent units; fewer than 3). Lloyd & Taylor: E0 = 515 K is outside 30–450 K (Reichstein et al. 2005).',
    ]);
  });

  it("when a treatment cannot be fitted, then the engine's reason is shown instead of numbers", async () => {
    const { rows } = await render();
    expect(rows()[1]).toEqual([
      'TRENCH (collar)',
      '1 (1)',
      'not fitted',
      'not fitted',
      'not fitted ; not fitted',
      'fewer than 5 points (1)',
    ]);
  });

  it('when the chart draws, then every plot-round mean is a point coloured from dry (sand) to wet (blue), with both curves', async () => {
    const { el } = await render();
    const points = Array.from(el.querySelectorAll('[data-testid="response-chart"] circle'));
    expect(points.map((c) => c.getAttribute('fill'))).toEqual(['rgb(214, 170, 96)', 'rgb(119, 121, 128)', 'rgb(24, 72, 160)']);
    expect(points[1].querySelector('title')!.textContent).toBe('10.0 °C, 2.00 µmol m⁻² s⁻¹, VWC 30 %');
    expect(el.querySelector('[data-testid="curve-lloyd-taylor"]')!.getAttribute('d')).toMatch(
      /^M[\d.]+,[\d.]+L[\d.]+,[\d.]+L[\d.]+,[\d.]+$/,
    );
    expect(el.querySelector('[data-testid="curve-q10"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="response-chart"]')!.getAttribute('aria-label')).toBe(
      'Flux against soil temperature at 5 cm for CTRL, points coloured by soil moisture',
    );
    expect(el.querySelector('.legend')!.textContent).toContain('sand = dry (20 % VWC) → blue = wet (40 %)');
  });

  it('when another treatment is chosen, then its points replace the first and a cell without curves draws none', async () => {
    const { el, fixture } = await render();
    (el.querySelector('mat-select[name=responseCell]') as HTMLElement).click();
    await fixture.whenStable();
    const option = Array.from(document.querySelectorAll('mat-option')).find((o) => o.textContent!.includes('TRENCH'))! as HTMLElement;
    option.click();
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="response-chart"] circle')).toHaveLength(1);
    expect(el.querySelector('[data-testid="curve-q10"]')).toBeNull();
  });
});
