import { HttpClient, HttpContext, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { SessionExpiry } from '../auth/session-expiry';
import { SKIP_SESSION_EXPIRY, apiInterceptor } from './api-interceptor';
import { ConnectionStatus } from './connection-status';

describe('apiInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  /** Lets the CSRF promise resolve before the next expectOne. */
  const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

  it('when reading, then it sends credentials, bypasses the service worker and sends no CSRF token', async () => {
    const answer = firstValueFrom(http.get('/api/sites'));
    const req = backend.expectOne('/api/sites');
    expect(req.request.withCredentials).toBe(true);
    expect(req.request.headers.get('ngsw-bypass')).toBe('true');
    expect(req.request.headers.has('X-CSRF-Token')).toBe(false);
    req.flush({ items: [], total: 0 });
    await expect(answer).resolves.toEqual({ items: [], total: 0 });
  });

  it('when changing state, then it fetches the CSRF token once and sends it on every such request', async () => {
    const first = firstValueFrom(http.post('/api/things', { a: 1 }));
    const second = firstValueFrom(http.delete('/api/things/7'));
    backend.expectOne('/api/auth/csrf').flush({ token: 'tok-123' });
    await settle();
    const post = backend.expectOne((r) => r.method === 'POST');
    const del = backend.expectOne((r) => r.method === 'DELETE');
    expect(post.request.headers.get('X-CSRF-Token')).toBe('tok-123');
    expect(del.request.headers.get('X-CSRF-Token')).toBe('tok-123');
    post.flush({ ok: 1 });
    del.flush(null, { status: 204, statusText: 'No Content' });
    await expect(first).resolves.toEqual({ ok: 1 });
    await expect(second).resolves.toBeNull();
  });

  it('when the server refuses the CSRF token, then it fetches a new one and retries once', async () => {
    const answer = firstValueFrom(http.put('/api/things/1', { b: 2 }));
    backend.expectOne('/api/auth/csrf').flush({ token: 'old' });
    await settle();
    backend
      .expectOne((r) => r.method === 'PUT')
      .flush({ error: { message: 'Invalid CSRF token' } }, { status: 403, statusText: 'Forbidden' });
    backend.expectOne('/api/auth/csrf').flush({ token: 'new' });
    await settle();
    const retry = backend.expectOne((r) => r.method === 'PUT');
    expect(retry.request.headers.get('X-CSRF-Token')).toBe('new');
    retry.flush({ saved: true });
    await expect(answer).resolves.toEqual({ saved: true });
  });

  it('when the server answers 401, then the session is marked ended and the caller still gets the error', async () => {
    const answer = firstValueFrom(http.get('/api/sites'));
    backend.expectOne('/api/sites').flush({ error: { message: 'Sign in first' } }, { status: 401, statusText: 'Unauthorized' });
    await expect(answer).rejects.toMatchObject({ status: 401 });
    expect(TestBed.inject(SessionExpiry).expired()).toBe(true);
  });

  it('when sign-in itself answers 401, then it is a wrong password, not an ended session', async () => {
    const answer = firstValueFrom(http.get('/api/auth/me', { context: new HttpContext().set(SKIP_SESSION_EXPIRY, true) }));
    backend.expectOne('/api/auth/me').flush({ error: { message: 'Wrong' } }, { status: 401, statusText: 'Unauthorized' });
    await expect(answer).rejects.toMatchObject({ status: 401 });
    expect(TestBed.inject(SessionExpiry).expired()).toBe(false);
  });

  it('when the network fails, then the app is reported offline and nothing counts as an ended session', async () => {
    const answer = firstValueFrom(http.get('/api/sites'));
    backend.expectOne('/api/sites').error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await expect(answer).rejects.toMatchObject({ status: 0 });
    expect(TestBed.inject(ConnectionStatus).offline()).toBe(true);
    expect(TestBed.inject(SessionExpiry).expired()).toBe(false);
  });

  it('when the service worker answers 504 without a server body, then that is offline too', async () => {
    const answer = firstValueFrom(http.get('/api/auth/me'));
    backend.expectOne('/api/auth/me').flush(null, { status: 504, statusText: 'Gateway Timeout' });
    await expect(answer).rejects.toMatchObject({ status: 504 });
    expect(TestBed.inject(ConnectionStatus).offline()).toBe(true);
  });

  it('when offline and a later request reaches the server, then the app is back online', async () => {
    const status = TestBed.inject(ConnectionStatus);
    status.reportOffline();
    const answer = firstValueFrom(http.get('/api/sites'));
    backend.expectOne('/api/sites').flush({ items: [], total: 0 });
    await answer;
    expect(status.offline()).toBe(false);
  });

  it('when the request is not for the API, then it is passed on untouched', async () => {
    const answer = firstValueFrom(http.post('/other/place', {}));
    const req = backend.expectOne('/other/place');
    expect(req.request.withCredentials).toBe(false);
    expect(req.request.headers.has('X-CSRF-Token')).toBe(false);
    req.flush({});
    await answer;
  });
});
