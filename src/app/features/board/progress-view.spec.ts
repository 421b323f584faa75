import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { PROGRESS_STATE_WORDS, PROGRESS_STATES } from '../../../../shared/model/progress-state';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import type { ProgressCollar } from './board-api';
import { BoardStore } from './board-store';
import { ProgressView } from './progress-view';

const collar = (code: string, state: ProgressCollar['state'], items: ProgressCollar['items'] = {}): ProgressCollar => ({
  collarId: `id-${code}`,
  code,
  routeId: null,
  plotId: 'p',
  state,
  skipReason: state === 'skipped' ? 'Flooded' : null,
  items,
});

async function render() {
  localStorage.clear();
  rememberOnDevice(testUser(['lead']));
  TestBed.configureTestingModule({ imports: [ProgressView], providers: [BoardStore, provideHttpClient(), provideHttpClientTesting()] });
  const store = TestBed.inject(BoardStore);
  store.progress.set({
    collars: [
      collar('C1', 'due', { closures: { state: 'due', done: 0, needed: 1 } }),
      collar('C2', 'partial', { offset: { state: 'complete', done: 1, needed: 1 }, closures: { state: 'partial', done: 1, needed: 2 } }),
      collar('C3', 'complete'),
      collar('C4', 'complete'),
      collar('C5', 'skipped'),
    ],
    totals: { byRoute: {}, byPlot: {}, byTreatment: {} },
  });
  const fixture = TestBed.createComponent(ProgressView);
  await fixture.whenStable();
  return fixture.nativeElement as HTMLElement;
}

describe('Board progress words', () => {
  it('when collars are counted, then each count carries the word of the shared state table', async () => {
    const el = await render();
    const counts = { due: 1, partial: 1, complete: 2, skipped: 1 };
    const text = el.querySelector('[data-testid="progress-counts"]')!.textContent!.replace(/\s+/g, ' ');
    expect(text).toContain(PROGRESS_STATES.map((s) => `${counts[s]} ${PROGRESS_STATE_WORDS[s]}`).join(' · '));
  });

  it('when the bars are read aloud, then each state is named with the word of the shared state table', async () => {
    const el = await render();
    const bar = el.querySelector('.bar[role="img"]')!.getAttribute('aria-label')!;
    expect(bar).toBe(
      `No route: 2 ${PROGRESS_STATE_WORDS.complete}, 1 ${PROGRESS_STATE_WORDS.skipped}, 1 ${PROGRESS_STATE_WORDS.partial}, 1 ${PROGRESS_STATE_WORDS.due} of 5`,
    );
  });
});
