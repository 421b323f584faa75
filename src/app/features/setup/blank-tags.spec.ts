import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { until } from '../../core/db/testing/until';
import { BlankTags } from './blank-tags';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';

async function render() {
  TestBed.configureTestingModule({ imports: [BlankTags], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(BlankTags);
  fixture.componentRef.setInput('siteId', SITE);
  fixture.detectChanges();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const el = fixture.nativeElement as HTMLElement;
  const input = (id: string) => loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }));
  return { fixture, loader, el, input, http: TestBed.inject(HttpTestingController) };
}

describe('Blank tags for new collars', () => {
  it('when a prefix is given, then the planned codes are spelled out and the sheet is asked for with them', async () => {
    const { loader, el, input, http } = await render();
    expect(el.querySelector('[data-testid="blank-preview"]')!.textContent).toContain('21 tags without codes');
    await (await input('blank-prefix')).setValue('N-');
    await (await input('blank-count')).setValue('12');
    await (await input('blank-first')).setValue('7');
    expect(el.querySelector('[data-testid="blank-preview"]')!.textContent).toBe('Planned codes N-07 … N-18.');
    const clicks = jest.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => undefined);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Download blank tags (PDF)' }))).click();
    const req = http.expectOne((r) => r.url === `/api/sites/${SITE}/blank-collar-tags.pdf`);
    expect(req.request.params.toString()).toBe('paper=a4&count=12&codePrefix=N-&firstNumber=7&digits=2');
    req.flush(new Blob(['%PDF-'], { type: 'application/pdf' }), {
      headers: { 'Content-Disposition': 'attachment; filename="new-collar-tags-test-a4.pdf"', 'X-Tag-Count': '12' },
    });
    await until(
      () => el.querySelector('[role="status"]')!.textContent!.includes('12 blank tags saved as new-collar-tags-test-a4.pdf'),
      'the message',
    );
    expect(clicks).toHaveBeenCalledTimes(1);
    clicks.mockRestore();
  });

  it('when the server refuses (codes in use), then its message is shown, read from the error body', async () => {
    const { loader, el, input, http } = await render();
    await (await input('blank-prefix')).setValue('C');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Download blank tags (PDF)' }))).click();
    const body = { error: { message: 'These codes are already used at this site: C01, C02. Choose another prefix or first number.' } };
    http
      .expectOne(() => true)
      .flush(new Blob([JSON.stringify(body)], { type: 'application/json' }), { status: 409, statusText: 'Conflict' });
    await until(() => el.querySelector('[role="alert"]')?.textContent?.includes('already used at this site: C01, C02'), 'the refusal');
  });
});
