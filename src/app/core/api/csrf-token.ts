import { HttpBackend, HttpHeaders, HttpRequest, HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { filter, firstValueFrom, map } from 'rxjs';

/**
 * The CSRF token the server wants back on every state-changing request. It is fetched lazily
 * and shared by concurrent requests; the server issues a new one at sign-in and sign-out, so
 * those call `invalidate()`. The fetch goes through HttpBackend, past the interceptors, so it
 * can never recurse into itself.
 */
@Injectable({ providedIn: 'root' })
export class CsrfToken {
  private readonly backend = inject(HttpBackend);
  private pending: Promise<string> | null = null;

  get(): Promise<string> {
    this.pending ??= this.fetch().catch((err: unknown) => {
      this.pending = null;
      throw err;
    });
    return this.pending;
  }

  invalidate(): void {
    this.pending = null;
  }

  private fetch(): Promise<string> {
    const req = new HttpRequest<null>('GET', '/api/auth/csrf', null, {
      withCredentials: true,
      responseType: 'json',
      headers: new HttpHeaders({ Accept: 'application/json', 'ngsw-bypass': 'true' }),
    });
    return firstValueFrom(
      this.backend.handle(req).pipe(
        filter((e): e is HttpResponse<unknown> => e instanceof HttpResponse),
        map((res) => {
          const token = (res.body as { token?: unknown } | null)?.token;
          if (typeof token !== 'string' || !token) throw new Error('The server sent no CSRF token');
          return token;
        }),
      ),
    );
  }
}
