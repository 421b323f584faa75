import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { DIGEST_STATE_LINES, digestWithStateCounts } from '../../../../shared/model/testing/digest-words';
import type { Digest, JobState } from './board-api';
import { BoardStore } from './board-store';
import { DIGEST_POLL_MS, DigestPanel } from './digest-panel';

const settle = () => new Promise((r) => setTimeout(r, 0));
const job = (over: Partial<JobState>): JobState => ({
  id: 'job-1',
  state: 'queued',
  done: 0,
  total: null,
  result: null,
  error: null,
  ...over,
});

async function render() {
  localStorage.clear();
  rememberOnDevice(testUser(['lead'], { email: 'lead@fluxwalk.example' }));
  TestBed.configureTestingModule({ imports: [DigestPanel], providers: [BoardStore, provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(DigestPanel);
  const loader = TestbedHarnessEnvironment.loader(fixture);
  await fixture.whenStable();
  const http = TestBed.inject(HttpTestingController);
  const el = fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const button = (name: string) => loader.getHarness(MatButtonHarness.with({ text: name }));
  const stable = async () => {
    await settle();
    await fixture.whenStable();
  };
  return { fixture, http, text, button, stable };
}

describe('DigestPanel', () => {
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  it('when the lead asks for the digest now, then it is queued for them and the panel says where it went once the job is done', async () => {
    const { http, text, button, stable, fixture } = await render();
    await (await button('Send me the digest now')).click();
    const post = http.expectOne('/api/sites/site-a/digest/send');
    expect(post.request.method).toBe('POST');
    post.flush({ jobId: 'job-1', to: 'lead@fluxwalk.example' }, { status: 202, statusText: 'Accepted' });
    await stable();
    expect(text('[data-testid="digest-status"]')).toBe('Digest for Hollow Creek Meadow is on its way to lead@fluxwalk.example…');
    http.expectOne('/api/jobs/job-1').flush({ job: job({ state: 'active' }) });
    await stable();
    expect(await (await button('Send me the digest now')).isDisabled()).toBe(true);

    await new Promise((r) => setTimeout(r, DIGEST_POLL_MS + 50));
    http
      .expectOne('/api/jobs/job-1')
      .flush({ job: job({ state: 'completed', done: 1, total: 1, result: { sent: 1, recipients: 1, due: 12 } }) });
    await stable();
    expect(text('[data-testid="digest-status"]')).toBe('Digest sent to lead@fluxwalk.example (12 collar(s) due).');
    expect(await (await button('Send me the digest now')).isDisabled()).toBe(false);
    fixture.destroy();
  });

  it('when the mail job fails, then the reason is shown as an alert', async () => {
    const { http, text, button, stable } = await render();
    await (await button('Send me the digest now')).click();
    http.expectOne('/api/sites/site-a/digest/send').flush({ jobId: 'job-2', to: 'lead@fluxwalk.example' });
    await stable();
    http.expectOne('/api/jobs/job-2').flush({ job: job({ id: 'job-2', state: 'failed', error: 'SMTP_HOST is not set' }) });
    await stable();
    expect(text('[role="alert"]')).toBe('The digest was not sent yet: SMTP_HOST is not set (the server tries again a few times).');
    expect(text('[data-testid="digest-status"]')).toBe('');
  });

  it('when the preview opens, then it lists due collars per route (long lists counted), partial ones with what they miss, anomalies and silent devices', async () => {
    const { http, text, button, stable } = await render();
    await (await button('Preview digest')).click();
    const due = Array.from({ length: 45 }, (_, i) => `C${String(i + 1).padStart(3, '0')}`);
    const digest: Digest = {
      site: { id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Europe/Vienna' },
      localDate: '2026-05-04',
      campaigns: [
        {
          id: 'c1',
          name: 'May round',
          startsOn: '2026-05-03',
          endsOn: '2026-05-05',
          routes: [
            {
              routeId: 'r1',
              routeName: 'North loop',
              due,
              partial: [{ code: 'C200', missing: ['closures 1/2'] }],
              complete: 3,
              skipped: 1,
            },
          ],
        },
      ],
      anomalies: {
        total: 1,
        problems: 1,
        items: [
          {
            kind: 'offset-moved',
            severity: 'problem',
            collarId: 'k',
            collarCode: 'C007',
            recordId: 'o',
            at: null,
            value: 1.4,
            threshold: 1,
            message: 'Offset moved 1.4 cm since the last campaign',
          },
        ],
      },
      silentDevices: [{ displayName: 'Rowan Ashby', email: 'crew@fluxwalk.example', lastSeenAt: null, outboxSize: 4 }],
    };
    http.expectOne('/api/sites/site-a/digest').flush({ digest });
    await stable();
    const preview = text('[data-testid="digest-preview"]');
    expect(preview).toContain('North loop: 45 due, 1 partial, 3 complete, 1 skipped');
    expect(preview).toContain(`Due: ${due.slice(0, 40).join(', ')} and 5 more`);
    expect(preview).toContain('Partial C200: still needs closures 1/2');
    expect(preview).toContain('Act: C007: Offset moved 1.4 cm since the last campaign');
    expect(preview).toContain('Rowan Ashby (crew@fluxwalk.example), 4 not yet synced');
  });

  it('when the preview counts collars per state, then each count carries the word the shared state table gives that state', async () => {
    const { http, text, button, stable } = await render();
    await (await button('Preview digest')).click();
    const digest: Digest = digestWithStateCounts({ id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Europe/Vienna' });
    http.expectOne('/api/sites/site-a/digest').flush({ digest });
    await stable();
    const preview = text('[data-testid="digest-preview"]');
    expect(preview).toContain(DIGEST_STATE_LINES.counts);
    expect(preview).toContain(`${DIGEST_STATE_LINES.dueHeading}: C1`);
    expect(preview).toContain(DIGEST_STATE_LINES.partial);
  });
});
