import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, Router, RouterStateSnapshot, UrlTree, provideRouter } from '@angular/router';
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { destinationGuard, signedInGuard, signedOutGuard } from './auth-guards';
import { rememberOnDevice, testUser } from './testing/demo-sessions';
import { Role } from './session-user';

function run(guard: typeof signedInGuard, url = '/walk'): boolean | UrlTree {
  return TestBed.runInInjectionContext(() => guard({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot) as boolean | UrlTree);
}

function serialized(result: boolean | UrlTree): string | boolean {
  return result instanceof UrlTree ? TestBed.inject(Router).serializeUrl(result) : result;
}

function setUp(roles: Role[] | null): void {
  localStorage.clear();
  if (roles) rememberOnDevice(testUser(roles));
  TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
}

describe('signedInGuard', () => {
  it('when nobody is remembered on the device, then it sends to sign-in with the wanted page', () => {
    setUp(null);
    expect(serialized(run(signedInGuard, '/board'))).toBe('/sign-in?returnTo=%2Fboard');
  });

  it('when a user is remembered from an earlier sign-in, then it lets them in without asking the server', () => {
    setUp(['crew']);
    expect(run(signedInGuard)).toBe(true);
  });
});

describe('signedOutGuard', () => {
  it('when a lab user is remembered, then the sign-in page sends them to Bench', () => {
    setUp(['lab']);
    expect(serialized(run(signedOutGuard, '/sign-in'))).toBe('/bench');
  });

  it('when nobody is signed in, then the sign-in page opens', () => {
    setUp(null);
    expect(run(signedOutGuard, '/sign-in')).toBe(true);
  });
});

describe('destinationGuard', () => {
  it('when a crew user opens Board, then they land on Walk instead', () => {
    setUp(['crew']);
    expect(serialized(run(destinationGuard('board'), '/board'))).toBe('/walk');
  });

  it('when a lead opens Board, then it opens', () => {
    setUp(['lead']);
    expect(run(destinationGuard('board'), '/board')).toBe(true);
  });

  it('when an admin opens Walk, then they land on Setup', () => {
    setUp(['admin']);
    expect(serialized(run(destinationGuard('walk'), '/walk'))).toBe('/setup');
  });

  it('when a user has no role that opens a screen, then they land on the no-destinations page', () => {
    setUp([]);
    expect(serialized(run(destinationGuard('setup'), '/setup'))).toBe('/no-destinations');
  });
});
