import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import type { Role } from '../../core/auth/session-user';
import type { RecomputeJob } from './bench-api';
import { RecomputePanel } from './recompute-panel';

function job(over: Partial<RecomputeJob>): RecomputeJob {
  return {
    id: 'job-1',
    name: 'closure-recompute',
    siteId: 'site-a',
    state: 'queued',
    done: 0,
    total: null,
    result: null,
    error: null,
    createdAt: '2026-05-04T08:00:00.000Z',
    startedAt: null,
    finishedAt: null,
    ...over,
  };
}

const settle = () => new Promise((r) => setTimeout(r, 0));

async function render(roles: Role[], jobs: RecomputeJob[], timezone?: string) {
  localStorage.clear();
  if (timezone) rememberOnDevice(testUser(roles), [{ id: 'site-a', name: 'Hollow Creek Meadow', timezone }]);
  else rememberOnDevice(testUser(roles));
  TestBed.configureTestingModule({ imports: [RecomputePanel], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(RecomputePanel);
  fixture.componentRef.setInput('siteId', 'site-a');
  const changed: RecomputeJob[] = [];
  fixture.componentInstance.changed.subscribe((j) => changed.push(j));
  const http = TestBed.inject(HttpTestingController);
  fixture.detectChanges();
  const list = http.expectOne((r) => r.url === '/api/jobs');
  expect(list.request.params.get('name')).toBe('closure-recompute');
  list.flush({ items: jobs });
  await settle();
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const items = () =>
    Array.from(el.querySelectorAll('[data-testid="recompute-jobs"] li')).map((li) => li.textContent!.replace(/\s+/g, ' ').trim());
  const button = () => Array.from(el.querySelectorAll('button')).find((b) => b.textContent!.trim() === 'Recompute this site') ?? null;
  return { fixture, http, el, items, button, changed };
}

describe('RecomputePanel', () => {
  afterEach(() => TestBed.inject(HttpTestingController).verify({ ignoreCancelled: true }));

  it('when a job is listed, then the time it was asked reads in the site’s zone (naming it), not the device’s', async () => {
    // The device runs in UTC here; 08:00 UTC on 4 May is 20:00 in Auckland (NZST, UTC+12).
    const { items, fixture } = await render(
      ['lab'],
      [job({ state: 'completed', done: 1, total: 1, result: { examined: 1, changed: 0, lockedKept: 0, changedIds: [] } })],
      'Pacific/Auckland',
    );
    expect(items()[0]).toContain('asked 2026-05-04 20:00 NZST');
    fixture.destroy();
  });

  it('when a recompute of the chosen site is running, then its progress bar shows done of total and other sites are left out', async () => {
    const { el, items, fixture } = await render(
      ['lab'],
      [
        job({ id: 'j-a', state: 'active', done: 400, total: 1600 }),
        job({
          id: 'j-b',
          siteId: 'site-b',
          state: 'completed',
          done: 10,
          total: 10,
          result: { examined: 10, changed: 2, lockedKept: 0, changedIds: [] },
        }),
      ],
    );
    const bar = el.querySelector('mat-progress-bar')!;
    expect(bar.getAttribute('aria-valuenow')).toBe('25');
    expect(bar.getAttribute('aria-label')).toBe('Recompute progress, 400 of 1600 closures');
    expect(items()).toHaveLength(1);
    expect(items()[0]).toContain('running');
    expect(items()[0]).toContain('400 / 1600 closures');
    fixture.destroy();
  });

  it('when the lab asks to recompute the site, then the job is followed to its end, what it changed is shown and the queue is told', async () => {
    const { http, button, items, fixture, changed } = await render(['lab'], []);
    expect(items()).toEqual(['No recompute for this site yet.']);
    button()!.click();
    const post = http.expectOne('/api/bench/recompute');
    expect([post.request.method, post.request.body]).toEqual(['POST', { siteId: 'site-a' }]);
    post.flush({ jobId: 'job-9' }, { status: 202, statusText: 'Accepted' });
    await settle();
    http.expectOne('/api/jobs/job-9').flush({ job: job({ id: 'job-9' }) });
    await settle();
    await fixture.whenStable();
    expect(items()[0]).toContain('waiting');
    expect(button()!.disabled).toBe(true);

    // The next poll finds it finished.
    fixture.componentInstance.refresh();
    await settle();
    fixture.detectChanges();
    await settle();
    http
      .expectOne((r) => r.url === '/api/jobs')
      .flush({
        items: [
          job({
            id: 'job-9',
            state: 'completed',
            done: 1600,
            total: 1600,
            result: { examined: 1600, changed: 37, lockedKept: 120, changedIds: [] },
          }),
        ],
      });
    await settle();
    await fixture.whenStable();
    expect(items()[0]).toContain('finished');
    expect(items()[0]).toContain('1600 closures looked at, 37 changed, 120 kept as published (closed campaigns)');
    expect(changed.map((j) => j.id)).toEqual(['job-9']);
    expect(button()!.disabled).toBe(false);
    fixture.destroy();
  });

  it('when a lead looks, then progress is shown but there is no recompute button (the server takes requests from the lab and admins)', async () => {
    const { button, items, fixture } = await render(['lead'], [job({ state: 'failed', error: 'connection lost' })]);
    expect(button()).toBeNull();
    expect(items()[0]).toContain('failed');
    expect(items()[0]).toContain('connection lost');
    fixture.destroy();
  });
});
