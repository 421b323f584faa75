import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { apiInterceptor } from '../../core/api/api-interceptor';
import { SessionExpiry } from '../../core/auth/session-expiry';
import { TEST_SITES, rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { SessionBanner } from './session-banner';

const tick = () => new Promise((r) => setTimeout(r, 0));
const lead = testUser(['lead'], { email: 'lead@fluxwalk.example' });

function setUp() {
  localStorage.clear();
  rememberOnDevice(lead);
  TestBed.configureTestingModule({
    imports: [SessionBanner],
    providers: [
      provideHttpClient(withInterceptors([apiInterceptor])),
      provideHttpClientTesting(),
      // Closed dialogs leave the DOM at once instead of after their exit animation.
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
    ],
  });
  const fixture = TestBed.createComponent(SessionBanner);
  return {
    fixture,
    loader: TestbedHarnessEnvironment.loader(fixture),
    root: TestbedHarnessEnvironment.documentRootLoader(fixture),
    expiry: TestBed.inject(SessionExpiry),
    backend: TestBed.inject(HttpTestingController),
  };
}

describe('SessionBanner', () => {
  it('when the session has not ended, then nothing is shown', async () => {
    const { fixture } = setUp();
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent.trim()).toBe('');
  });

  it('when the session ended and the password is entered again, then the same account signs in and the banner goes', async () => {
    const { fixture, loader, root, expiry, backend } = setUp();
    expiry.markExpired();
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('Your session has ended.');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in again' }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatInputHarness.with({ selector: '[type=password]' }))).setValue('fluxwalk-demo');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();

    backend.expectOne('/api/auth/csrf').flush({ token: 't1' });
    await tick();
    const login = backend.expectOne('/api/auth/login');
    expect(login.request.body).toEqual({ email: 'lead@fluxwalk.example', password: 'fluxwalk-demo' });
    login.flush({ user: lead });
    await tick();
    backend.expectOne('/api/sites').flush({ items: TEST_SITES, total: 2 });
    await tick();
    await fixture.whenStable();

    expect(expiry.expired()).toBe(false);
    expect(fixture.nativeElement.textContent).not.toContain('Your session has ended.');
    expect(await root.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
  });
});
