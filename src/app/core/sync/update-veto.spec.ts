import { TestBed } from '@angular/core/testing';
import { SwUpdate, UnrecoverableStateEvent, VersionEvent } from '@angular/service-worker';
import { Subject } from 'rxjs';
import { App } from '../../app';
import { AppUpdate } from '../sw-update/app-update';
import { PendingWorkGuard } from '../sw-update/pending-work-guard';
import { RELOAD_PAGE } from '../sw-update/reload-page';

class FakeSwUpdate {
  readonly isEnabled = true;
  readonly versionUpdates = new Subject<VersionEvent>();
  readonly unrecoverable = new Subject<UnrecoverableStateEvent>();
  checkForUpdate = jest.fn().mockResolvedValue(false);
}

async function settle(): Promise<void> {
  for (let i = 0; i < 5; i++) {
    TestBed.tick();
    await new Promise((r) => setTimeout(r, 0));
  }
}

function button(label: string): HTMLButtonElement {
  const b = [...document.querySelectorAll('button')].find((el) => el.textContent?.trim() === label);
  if (!b) throw new Error(`no "${label}" button; page says: ${document.body.textContent}`);
  return b as HTMLButtonElement;
}

describe('update prompt with unsent work', () => {
  it('when ops are not yet synced, then "Reload" says how many and reloads only on "Reload anyway"', async () => {
    const sw = new FakeSwUpdate();
    const reload = jest.fn();
    TestBed.configureTestingModule({
      providers: [
        { provide: SwUpdate, useValue: sw },
        { provide: RELOAD_PAGE, useValue: reload },
      ],
    });
    TestBed.inject(AppUpdate).start();
    TestBed.createComponent(App);
    TestBed.inject(PendingWorkGuard).report(2);
    sw.versionUpdates.next({ type: 'VERSION_READY', currentVersion: { hash: 'a' }, latestVersion: { hash: 'b' } });
    await settle();

    button('Reload').click();
    await settle();
    expect(reload).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('2 not yet synced');

    button('Reload anyway').click();
    await settle();
    expect(reload).toHaveBeenCalledTimes(1);
  });
});
