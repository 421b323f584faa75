import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { ExportPanel } from './export-panel';
import { ResultsApi } from './results-api';

describe('ExportPanel', () => {
  it('when no licence is chosen, then the package cannot be built; once one is, the export asks for it by SPDX id', async () => {
    const startExport = jest.fn().mockResolvedValue({ jobId: 'job-1' });
    const exportJob = jest.fn().mockResolvedValue({
      job: { id: 'job-1', state: 'completed', done: 3, total: 3, error: null, result: { fileName: 'f.zip', sizeBytes: 2048 } },
    });
    TestBed.configureTestingModule({ imports: [ExportPanel], providers: [{ provide: ResultsApi, useValue: { startExport, exportJob } }] });
    const fixture = TestBed.createComponent(ExportPanel);
    fixture.componentRef.setInput('siteId', 'site-1');
    fixture.componentRef.setInput('selection', 'accepted');
    fixture.componentRef.setInput('model', 'q10');
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const build = await loader.getHarness(MatButtonHarness.with({ text: 'Build data package' }));
    expect(await build.isDisabled()).toBe(true);
    await (await loader.getHarness(MatSelectHarness)).clickOptions({ text: /^CC-BY-4\.0/ });
    expect(await build.isDisabled()).toBe(false);
    await build.click();
    await fixture.whenStable();
    expect(startExport).toHaveBeenCalledWith('site-1', 'accepted', 'q10', 'CC-BY-4.0');
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="export-download"]')!.textContent).toContain('f.zip');
  });
});
