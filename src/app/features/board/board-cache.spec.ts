import { HttpErrorResponse } from '@angular/common/http';
import { TestBed } from '@angular/core/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { BoardCache } from './board-cache';

const leadA = testUser(['lead'], { id: 'user-a' });
const leadB = testUser(['lead'], { id: 'user-b' });

/** The cache as the app gets it, for whoever is signed in on the device now. */
function cacheFor(user = leadA): BoardCache {
  TestBed.resetTestingModule();
  rememberOnDevice(user);
  return TestBed.inject(BoardCache);
}

describe('BoardCache', () => {
  beforeEach(() => localStorage.clear());

  async function idle(): Promise<void> {
    await new Promise((r) => setTimeout(r, 300));
  }

  it('when the server answers, then the answer is shown live and kept for later', async () => {
    const cache = cacheFor();
    const r = await cache.load('progress.x', async () => ({ n: 1 }));
    expect(r).toMatchObject({ value: { n: 1 }, fromCache: false });
    await idle();
    expect(cache.recall('progress.x')).toMatchObject({ value: { n: 1 }, savedAt: r.savedAt });
  });

  it('when offline, then the last kept answer is shown and marked as a copy', async () => {
    const cache = cacheFor();
    await cache.load('progress.x', async () => ({ n: 2 }));
    await idle();
    const r = await cache.load('progress.x', () => Promise.reject(new HttpErrorResponse({ status: 0 })));
    expect(r).toMatchObject({ value: { n: 2 }, fromCache: true });
  });

  it('when the server refuses (403), then the error reaches the screen even with a kept copy', async () => {
    const cache = cacheFor();
    await cache.load('devices.s', async () => [1]);
    await idle();
    const refused = new HttpErrorResponse({ status: 403, error: { error: { message: 'Your role does not allow this' } } });
    await expect(cache.load('devices.s', () => Promise.reject(refused))).rejects.toBe(refused);
  });

  it('when offline with nothing kept, then the offline error reaches the screen', async () => {
    const offline = new HttpErrorResponse({ status: 0 });
    await expect(cacheFor().load('never', () => Promise.reject(offline))).rejects.toBe(offline);
  });

  it("when two users use the same tablet, then the kept answers are stored under each user and B never sees A's", async () => {
    const a = cacheFor(leadA);
    await a.load('progress.site-a.c1', async () => ({ collars: ['A-only'] }));
    await idle();
    expect(Object.keys(localStorage).filter((k) => k.includes('progress.site-a.c1'))).toEqual(['fw.board.user-a.progress.site-a.c1']);
    const b = cacheFor(leadB); // A signed out, B signed in on the same device
    expect(b.recall('progress.site-a.c1')).toBeNull();
    const offline = new HttpErrorResponse({ status: 0 });
    await expect(b.load('progress.site-a.c1', () => Promise.reject(offline))).rejects.toBe(offline);
    expect(cacheFor(leadA).recall('progress.site-a.c1')).toMatchObject({ value: { collars: ['A-only'] } });
  });

  it('when nobody is signed in, then nothing is kept or recalled', async () => {
    TestBed.resetTestingModule();
    localStorage.setItem('fw.board.progress.x', JSON.stringify({ value: 1, savedAt: 'then' }));
    const c = TestBed.inject(BoardCache);
    await c.load('progress.x', async () => 2);
    await idle();
    expect(c.recall('progress.x')).toBeNull();
    expect(Object.keys(localStorage)).toEqual([]); // an unowned copy left by an earlier version is dropped too
  });
});
