import { TestBed } from '@angular/core/testing';
import { SummaryTable } from './summary-table';
import { SUMMARY } from './testing/results-fixtures';

async function render() {
  TestBed.configureTestingModule({ imports: [SummaryTable] });
  const fixture = TestBed.createComponent(SummaryTable);
  fixture.componentRef.setInput('data', SUMMARY);
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const cells = (sel: string) =>
    Array.from(el.querySelectorAll(sel)).map((r) => Array.from(r.children).map((c) => c.textContent!.replace(/\s+/g, ' ').trim()));
  return { el, cells };
}

describe('SummaryTable', () => {
  it('when cell means arrive, then each campaign × treatment is a row with mean ± SE, SE over blocks and n at every level', async () => {
    const { cells } = await render();
    expect(cells('thead tr')[0]).toEqual([
      'Campaign',
      'Treatment',
      'Mean',
      '± SE',
      'SEblock',
      'n plots',
      'collars',
      'visits',
      'closures',
      'Soil °C',
      'VWC %',
    ]);
    expect(cells('tbody tr')).toEqual([
      ['April round', 'CTRL', '2.35', '0.12', '0.10', '4', '12', '12', '36', '8.4', '31.3'],
      // One plot: no SE can be given, and a missing temperature or moisture is a dash, not a zero.
      ['May round', 'TRENCH (collar)', '1.01', '—', '—', '1', '3', '3', '9', '—', '—'],
    ]);
  });

  it('when shown, then the counts say plots are the replicates', async () => {
    const { el } = await render();
    const text = el.querySelector('.counts')!.textContent!.replace(/\s+/g, ' ');
    expect(text).toContain('45 closures · 15 visits · 15 collars · 4 plots.');
    expect(text).toContain('n is the number of plots (the replicates)');
    expect(text).toContain('collar-level treatments: cell + plot');
  });

  it('when no closure is selected yet, then the table says so instead of showing an empty body', async () => {
    TestBed.configureTestingModule({ imports: [SummaryTable] });
    const fixture = TestBed.createComponent(SummaryTable);
    fixture.componentRef.setInput('data', { ...SUMMARY, cellMeans: [] });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('tbody')!.textContent!.trim()).toBe('No selected closures yet.');
  });
});
