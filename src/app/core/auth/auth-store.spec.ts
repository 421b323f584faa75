import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { apiInterceptor } from '../api/api-interceptor';
import { ConnectionStatus } from '../api/connection-status';
import { AuthStore } from './auth-store';
import { SessionExpiry } from './session-expiry';
import { rememberOnDevice, testUser } from './testing/demo-sessions';

function store(): AuthStore {
  TestBed.configureTestingModule({
    providers: [provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
  });
  return TestBed.inject(AuthStore);
}

describe('AuthStore', () => {
  beforeEach(() => localStorage.clear());

  it('when device storage holds a remembered crew user, then the app starts signed in as them', () => {
    rememberOnDevice(testUser(['crew'], { displayName: 'Ola Brandt' }));
    const auth = store();
    expect(auth.signedIn()).toBe(true);
    expect(auth.user()?.displayName).toBe('Ola Brandt');
    expect(auth.roles()).toEqual(['crew']);
  });

  it('when device storage holds something unreadable, then nobody is signed in', () => {
    localStorage.setItem('fw.session', '{"user":{"email":42}');
    expect(store().signedIn()).toBe(false);
  });

  it('when a stored user has a role this build does not know, then the known roles are kept', () => {
    localStorage.setItem('fw.session', JSON.stringify({ user: { ...testUser(['lab']), roles: ['lab', 'auditor'] }, sites: [] }));
    expect(store().roles()).toEqual(['lab']);
  });

  it('when refreshing offline, then the remembered user and sites stay', async () => {
    rememberOnDevice(testUser(['crew']));
    const auth = store();
    const done = auth.refresh();
    TestBed.inject(HttpTestingController).expectOne('/api/auth/me').error(new ProgressEvent('error'), { status: 0 });
    await done;
    TestBed.inject(HttpTestingController).expectNone('/api/sites');
    expect(auth.user()?.roles).toEqual(['crew']);
    expect(auth.sites()).toHaveLength(2);
    expect(TestBed.inject(ConnectionStatus).offline()).toBe(true);
  });

  it('when the server no longer knows the session, then the user stays on the device and is asked to sign in again', async () => {
    rememberOnDevice(testUser(['lead']));
    const auth = store();
    const done = auth.refresh();
    const backend = TestBed.inject(HttpTestingController);
    backend.expectOne('/api/auth/me').flush({ error: { message: 'Sign in first' } }, { status: 401, statusText: 'Unauthorized' });
    await done;
    backend.expectNone('/api/sites');
    expect(auth.signedIn()).toBe(true);
    expect(TestBed.inject(SessionExpiry).expired()).toBe(true);
  });

  it('when signing out offline, then the device forgets the user anyway', async () => {
    rememberOnDevice(testUser(['crew']));
    const auth = store();
    const done = auth.signOut();
    TestBed.inject(HttpTestingController).expectOne('/api/auth/csrf').error(new ProgressEvent('error'), { status: 0 });
    await done;
    expect(auth.signedIn()).toBe(false);
    expect(localStorage.getItem('fw.session')).toBeNull();
  });
});
