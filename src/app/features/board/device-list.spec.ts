import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { BoardStore } from './board-store';
import { DeviceList } from './device-list';

const settle = () => new Promise((r) => setTimeout(r, 0));

describe("Board times are the site's", () => {
  it("when a device was last heard from, then the Board shows it in the site's zone and names the zone", async () => {
    localStorage.clear();
    // Hollow Creek Meadow is in Anchorage for this test: far from both UTC and the test machine's zone.
    rememberOnDevice(testUser(['lead']), [{ id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'America/Anchorage' }]);
    TestBed.configureTestingModule({ imports: [DeviceList], providers: [BoardStore, provideHttpClient(), provideHttpClientTesting()] });
    const fixture = TestBed.createComponent(DeviceList);
    await fixture.whenStable();
    TestBed.inject(HttpTestingController)
      .expectOne('/api/sites/site-a/devices')
      .flush({
        items: [
          {
            id: 'dev-12345678',
            userId: 'u1',
            email: 'crew@fluxwalk.example',
            displayName: 'Crew',
            outboxSize: 0,
            silent: false,
            // 03:30 UTC on 2 July is 19:30 on 1 July in Anchorage (AKDT, UTC−8, tz database).
            lastPushAt: '2026-07-02T03:30:00.000Z',
            lastPullAt: null,
          },
        ],
      });
    await settle();
    await fixture.whenStable();
    const cells = [...(fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid="device-row"] td')].map((td) =>
      td.textContent!.trim(),
    );
    expect(cells[2]).toBe('2026-07-01 19:30 AKDT');
    expect(cells[3]).toBe('never');
  });
});
