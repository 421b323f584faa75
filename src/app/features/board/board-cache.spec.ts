import { HttpErrorResponse } from '@angular/common/http';
import { BoardCache } from './board-cache';

describe('BoardCache', () => {
  beforeEach(() => localStorage.clear());

  async function idle(): Promise<void> {
    await new Promise((r) => setTimeout(r, 300));
  }

  it('when the server answers, then the answer is shown live and kept for later', async () => {
    const cache = new BoardCache();
    const r = await cache.load('progress.x', async () => ({ n: 1 }));
    expect(r).toMatchObject({ value: { n: 1 }, fromCache: false });
    await idle();
    expect(cache.recall('progress.x')).toMatchObject({ value: { n: 1 }, savedAt: r.savedAt });
  });

  it('when offline, then the last kept answer is shown and marked as a copy', async () => {
    const cache = new BoardCache();
    await cache.load('progress.x', async () => ({ n: 2 }));
    await idle();
    const r = await cache.load('progress.x', () => Promise.reject(new HttpErrorResponse({ status: 0 })));
    expect(r).toMatchObject({ value: { n: 2 }, fromCache: true });
  });

  it('when the server refuses (403), then the error reaches the screen even with a kept copy', async () => {
    const cache = new BoardCache();
    await cache.load('devices.s', async () => [1]);
    await idle();
    const refused = new HttpErrorResponse({ status: 403, error: { error: { message: 'Your role does not allow this' } } });
    await expect(cache.load('devices.s', () => Promise.reject(refused))).rejects.toBe(refused);
  });

  it('when offline with nothing kept, then the offline error reaches the screen', async () => {
    const offline = new HttpErrorResponse({ status: 0 });
    await expect(new BoardCache().load('never', () => Promise.reject(offline))).rejects.toBe(offline);
  });
});
