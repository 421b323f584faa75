import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { routes } from './app.routes';
import { Role } from './core/auth/session-user';
import { rememberOnDevice, testUser } from './core/auth/testing/demo-sessions';

/** Where the real route table takes someone who opens `url`, signed in with `roles` or not. */
async function landingFor(url: string, roles: Role[] | null): Promise<string> {
  localStorage.clear();
  if (roles) rememberOnDevice(testUser(roles));
  TestBed.configureTestingModule({ providers: [provideRouter(routes), provideHttpClient(), provideHttpClientTesting()] });
  const harness = await RouterTestingHarness.create();
  await harness.navigateByUrl(url);
  TestBed.inject(HttpTestingController).match(() => true); // the shell's start-up refresh
  return TestBed.inject(Router).url;
}

describe('app routes', () => {
  it('when a signed-out visitor opens the root, then sign-in opens without a detour in returnTo', async () => {
    expect(await landingFor('/', null)).toBe('/sign-in');
  });

  it('when a signed-out visitor opens Board, then sign-in opens and remembers Board', async () => {
    expect(await landingFor('/board', null)).toBe('/sign-in?returnTo=%2Fboard');
  });

  it('when a remembered crew member opens the root, then Walk opens', async () => {
    expect(await landingFor('/', ['crew'])).toBe('/walk');
  });

  it('when a remembered admin opens an unknown address, then Setup opens', async () => {
    expect(await landingFor('/no/such/page', ['admin'])).toBe('/setup');
  });

  it('when someone with a screen opens the no-destinations page, then they go to their first screen', async () => {
    expect(await landingFor('/no-destinations', ['lab'])).toBe('/bench');
  });

  it('when an account without screen roles opens the root, then it is told there are no screens', async () => {
    expect(await landingFor('/', [])).toBe('/no-destinations');
  });
});
