import { ChangeDetectionStrategy, Component, OnDestroy, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { RouteReuseStrategy, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { AuthStore } from '../auth/auth-store';
import { KEEP_SCREEN_MS, KeptScreens } from './kept-screens';

let made = 0;
let destroyed = 0;

@Component({ selector: 'fw-test-list', template: '<p>list</p>', changeDetection: ChangeDetectionStrategy.OnPush })
class ListScreen implements OnDestroy {
  readonly no = ++made;
  ngOnDestroy(): void {
    destroyed++;
  }
}

@Component({ selector: 'fw-test-detail', template: '<p>detail</p>', changeDetection: ChangeDetectionStrategy.OnPush })
class DetailScreen {}

describe('Kept screens', () => {
  const user = signal<{ id: string } | null>({ id: 'crew-a' });

  async function start() {
    made = 0;
    destroyed = 0;
    user.set({ id: 'crew-a' });
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'list', data: { keepScreen: true }, component: ListScreen },
          { path: 'detail', component: DetailScreen },
          { path: 'other', component: DetailScreen },
        ]),
        { provide: RouteReuseStrategy, useExisting: KeptScreens },
        { provide: AuthStore, useValue: { user } },
      ],
    });
    const harness = await RouterTestingHarness.create();
    const first = await harness.navigateByUrl('/list', ListScreen);
    return { harness, first, kept: TestBed.inject(KeptScreens) };
  }

  it('when the user opens a detail and comes back, then the same list screen is put back, not made again', async () => {
    const { harness, first } = await start();
    await harness.navigateByUrl('/detail', DetailScreen);
    expect(destroyed).toBe(0);
    const again = await harness.navigateByUrl('/list', ListScreen);
    expect(again).toBe(first);
    expect(made).toBe(1);
    expect(harness.routeNativeElement?.textContent).toContain('list');
  });

  it('when another user signs in on the device, then the kept screen is ended at once and a new one made', async () => {
    const { harness, first } = await start();
    await harness.navigateByUrl('/detail', DetailScreen);
    user.set({ id: 'crew-b' });
    TestBed.tick();
    expect(destroyed).toBe(1);
    const again = await harness.navigateByUrl('/list', ListScreen);
    expect(again).not.toBe(first);
    expect(made).toBe(2);
    expect(destroyed).toBe(1);
  });

  it('when the user comes back after the keeping time, then the screen is made anew', async () => {
    const { harness, first, kept } = await start();
    const t0 = Date.now();
    kept.now = () => t0;
    await harness.navigateByUrl('/detail', DetailScreen);
    kept.now = () => t0 + KEEP_SCREEN_MS + 1;
    const again = await harness.navigateByUrl('/list', ListScreen);
    expect(again).not.toBe(first);
    expect(destroyed).toBe(1);
  });
});
