import { TestBed } from '@angular/core/testing';
import { SwUpdate, UnrecoverableStateEvent, VersionEvent } from '@angular/service-worker';
import { Subject } from 'rxjs';
import { AppUpdate } from './app-update';
import { PendingWorkGuard } from './pending-work-guard';
import { RELOAD_PAGE } from './reload-page';

class FakeSwUpdate {
  readonly isEnabled = true;
  readonly versionUpdates = new Subject<VersionEvent>();
  readonly unrecoverable = new Subject<UnrecoverableStateEvent>();
  checkForUpdate = jest.fn().mockResolvedValue(false);
}

function setUp() {
  const sw = new FakeSwUpdate();
  const reload = jest.fn();
  TestBed.configureTestingModule({
    providers: [
      { provide: SwUpdate, useValue: sw },
      { provide: RELOAD_PAGE, useValue: reload },
    ],
  });
  const update = TestBed.inject(AppUpdate);
  update.start();
  return { sw, reload, update, pending: TestBed.inject(PendingWorkGuard) };
}

const ready: VersionEvent = {
  type: 'VERSION_READY',
  currentVersion: { hash: 'a' },
  latestVersion: { hash: 'b' },
};

describe('AppUpdate', () => {
  it('when a new version is ready, then it is offered and the page is not reloaded by itself', () => {
    const { sw, reload, update } = setUp();
    sw.versionUpdates.next({ type: 'VERSION_DETECTED', version: { hash: 'b' } });
    expect(update.updateReady()).toBe(false);
    sw.versionUpdates.next(ready);
    expect(update.updateReady()).toBe(true);
    expect(reload).not.toHaveBeenCalled();
  });

  it('when the user accepts and no work is pending, then the page reloads', () => {
    const { sw, reload, update } = setUp();
    sw.versionUpdates.next(ready);
    expect(update.reloadToUpdate()).toBe(true);
    expect(reload).toHaveBeenCalledTimes(1);
  });

  it('when the user accepts while work is pending, then the reload is vetoed', () => {
    const { sw, reload, update, pending } = setUp();
    sw.versionUpdates.next(ready);
    pending.report(2);
    expect(update.reloadToUpdate()).toBe(false);
    expect(update.reloadBlocked()).toBe(true);
    expect(reload).not.toHaveBeenCalled();
  });

  it('when the worker becomes unrecoverable, then the page reloads once pending work is gone', async () => {
    const { sw, reload, pending } = setUp();
    pending.report(1);
    TestBed.tick();
    sw.unrecoverable.next({ type: 'UNRECOVERABLE_STATE', reason: 'chunk evicted' });
    TestBed.tick();
    expect(reload).not.toHaveBeenCalled();
    pending.report(0);
    TestBed.tick();
    expect(reload).toHaveBeenCalledTimes(1);
  });

  it('when the app comes back to the foreground, then it looks for a new version', () => {
    const { sw } = setUp();
    Object.defineProperty(document, 'visibilityState', { value: 'visible', configurable: true });
    document.dispatchEvent(new Event('visibilitychange'));
    expect(sw.checkForUpdate).toHaveBeenCalledTimes(1);
  });

  it('when the worker becomes unrecoverable with nothing pending, then the page reloads at once', () => {
    const { sw, reload } = setUp();
    TestBed.tick();
    sw.unrecoverable.next({ type: 'UNRECOVERABLE_STATE', reason: 'hash mismatch' });
    TestBed.tick();
    expect(reload).toHaveBeenCalledTimes(1);
  });
});
