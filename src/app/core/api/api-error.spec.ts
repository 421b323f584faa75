import { HttpErrorResponse, HttpHeaders } from '@angular/common/http';
import { fieldProblems, isOfflineError, retryAfterSeconds, serverMessage } from './api-error';

const error = (status: number, body: unknown = null, headers?: Record<string, string>) =>
  new HttpErrorResponse({ status, error: body, headers: new HttpHeaders(headers) });

describe('isOfflineError', () => {
  it('when the browser could not send the request (status 0), then it is offline', () => {
    expect(isOfflineError(error(0))).toBe(true);
  });

  it('when a gateway answers 502, 503 or 504 without our error body, then the server was not reached', () => {
    expect([502, 503, 504].map((s) => isOfflineError(error(s, '<html>Bad gateway</html>')))).toEqual([true, true, true]);
  });

  it('when our server itself answers 503 with its error body, then it is a server error, not offline', () => {
    expect(isOfflineError(error(503, { error: { message: 'Database unavailable' } }))).toBe(false);
  });

  it('when the server answers 500 or 401, then it is not offline', () => {
    expect(isOfflineError(error(500))).toBe(false);
    expect(isOfflineError(error(401, { error: { message: 'Sign in first' } }))).toBe(false);
  });
});

describe('server error details', () => {
  it('when the body follows the API error shape, then its message and field problems are read', () => {
    const err = error(400, { error: { message: 'Check the form', fields: [{ path: 'email', message: 'Required' }, { bad: 1 }] } });
    expect(serverMessage(err, 'fallback')).toBe('Check the form');
    expect(fieldProblems(err)).toEqual([{ path: 'email', message: 'Required' }]);
  });

  it('when the body is not ours, then the fallback message is used', () => {
    expect(serverMessage(error(500, 'Internal Server Error'), 'Something failed')).toBe('Something failed');
  });
});

describe('retryAfterSeconds (RFC 9110 §10.2.3: delay-seconds or HTTP-date)', () => {
  it('when Retry-After is a number of seconds, then that number is returned', () => {
    expect(retryAfterSeconds(error(429, null, { 'Retry-After': '900' }))).toBe(900);
  });

  it('when Retry-After is an HTTP date, then the seconds until then are returned', () => {
    const now = Date.parse('2026-05-04T10:00:00Z');
    expect(retryAfterSeconds(error(429, null, { 'Retry-After': 'Mon, 04 May 2026 10:02:30 GMT' }), now)).toBe(150);
  });

  it('when Retry-After is missing or unreadable, then there is no wait to tell', () => {
    expect(retryAfterSeconds(error(429))).toBeNull();
    expect(retryAfterSeconds(error(429, null, { 'Retry-After': 'soon' }))).toBeNull();
  });
});
