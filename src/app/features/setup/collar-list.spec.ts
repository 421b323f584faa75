import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonToggleGroupHarness } from '@angular/material/button-toggle/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { CollarList } from './collar-list';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';
const plot = (n: number) => ({ id: `00000000-0000-4000-8000-00000000000${n}`, rev: 1, siteId: SITE, code: `P${n}` });
const collars = [1, 1, 2, 1].map((p, i) => ({
  id: `c0000000-0000-4000-8000-00000000000${i}`,
  rev: 1,
  siteId: SITE,
  code: `C${i}`,
  plotId: plot(p).id,
}));

describe('CollarList tag sheet', () => {
  it('when one plot is chosen, then the sheet link asks for that plot only and the choice counts its collars', async () => {
    TestBed.configureTestingModule({ imports: [CollarList], providers: [provideHttpClient(), provideHttpClientTesting()] });
    const fixture = TestBed.createComponent(CollarList);
    fixture.componentRef.setInput('siteId', SITE);
    fixture.componentRef.setInput('plots', [plot(1), plot(2)]);
    fixture.detectChanges();
    TestBed.inject(HttpTestingController)
      .expectOne((r) => r.url === '/api/collars')
      .flush({ items: collars, total: 4, limit: 1000, offset: 0 });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const link = () =>
      (fixture.nativeElement as HTMLElement).querySelector<HTMLAnchorElement>('[data-testid=tag-sheet]')!.getAttribute('href');
    expect(link()).toBe(`/api/sites/${SITE}/collar-tags.pdf?paper=a4`);

    const select = await loader.getHarness(MatSelectHarness.with({ selector: '.tags mat-select' }));
    // Nothing chosen yet means every plot, and the field says so (it is not left blank).
    expect(await select.getValueText()).toBe('All plots (4 collars)');
    await select.open();
    expect(await Promise.all((await select.getOptions()).map((o) => o.getText()))).toEqual([
      'All plots (4 collars)',
      'Plot P1 (3 collars)',
      'Plot P2 (1 collar)',
    ]);
    await select.clickOptions({ text: 'Plot P2 (1 collar)' });
    await (await loader.getHarness(MatButtonToggleGroupHarness)).getToggles({ text: 'Letter' }).then(([t]) => t!.check());
    expect(link()).toBe(`/api/sites/${SITE}/collar-tags.pdf?paper=letter&plotId=${plot(2).id}`);
    await select.open();
    await select.clickOptions({ text: 'All plots (4 collars)' });
    expect(link()).toBe(`/api/sites/${SITE}/collar-tags.pdf?paper=letter`);
    expect(await select.getValueText()).toBe('All plots (4 collars)');
  });
});
