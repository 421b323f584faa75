import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { SKIP_SESSION_EXPIRY } from '../api/api-interceptor';
import { CsrfToken } from '../api/csrf-token';
import { DeviceMemory } from '../device/device-memory';
import { StoragePersistence } from '../device/storage-persistence';
import { SessionExpiry } from './session-expiry';
import { SessionUser, SiteSummary, parseSessionUser, parseSites } from './session-user';

const SESSION_KEY = 'fw.session';

interface RememberedSession {
  user: SessionUser;
  sites: SiteSummary[];
}

/**
 * Who is signed in on this device. The user, roles and sites are remembered in device storage
 * after one online sign-in, so the app opens offline straight into the user's screens; the
 * server is asked again (`refresh()`) whenever it can be reached. Signing out forgets them.
 */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly http = inject(HttpClient);
  private readonly csrf = inject(CsrfToken);
  private readonly memory = inject(DeviceMemory);
  private readonly expiry = inject(SessionExpiry);
  private readonly persistence = inject(StoragePersistence);
  private readonly session = signal<RememberedSession | null>(this.recall());

  readonly user = computed(() => this.session()?.user ?? null);
  readonly sites = computed(() => this.session()?.sites ?? []);
  readonly roles = computed(() => this.user()?.roles ?? []);
  readonly signedIn = computed(() => this.user() !== null);

  /** Signs in online; errors (401, 403, 429, offline) reach the caller, who explains them. */
  async signIn(email: string, password: string): Promise<SessionUser> {
    const res = await firstValueFrom(
      this.http.post<{ user: unknown }>(
        '/api/auth/login',
        { email, password },
        { context: new HttpContext().set(SKIP_SESSION_EXPIRY, true) },
      ),
    );
    const user = parseSessionUser(res?.user);
    if (!user) throw new Error('The server answered the sign-in without a user');
    // The server issues a new CSRF token with the new session.
    this.csrf.invalidate();
    this.expiry.clear();
    const keepSites = this.user()?.id === user.id ? this.sites() : [];
    this.remember({ user, sites: keepSites });
    void this.persistence.request();
    await this.refreshSites();
    return user;
  }

  /** "Sign in again" after a 401: same account, nothing on screen is touched. */
  signInAgain(password: string): Promise<SessionUser> {
    const email = this.user()?.email;
    if (!email) return Promise.reject(new Error('Nobody is signed in on this device'));
    return this.signIn(email, password);
  }

  /**
   * Asks the server who we are and which sites we see. Offline, the remembered session stays;
   * a 401 is turned into "sign in again" by the interceptor and the session also stays.
   */
  async refresh(): Promise<void> {
    if (!this.signedIn()) return;
    try {
      const res = await firstValueFrom(this.http.get<{ user: unknown }>('/api/auth/me'));
      const user = parseSessionUser(res?.user);
      if (user && this.session()) this.remember({ user, sites: this.sites() });
      await this.refreshSites();
    } catch (err) {
      // Offline and 401 were already reported by the interceptor; anything else is a bug.
      if (!(err instanceof HttpErrorResponse)) throw err;
    }
  }

  /** Ends the session on the server when reachable, and always forgets it on this device. */
  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.http.post('/api/auth/logout', null, { context: new HttpContext().set(SKIP_SESSION_EXPIRY, true) }));
    } catch {
      // Offline or already ended: the device forgets the session anyway.
    }
    this.csrf.invalidate();
    this.expiry.clear();
    this.memory.remove(SESSION_KEY);
    this.session.set(null);
  }

  private async refreshSites(): Promise<void> {
    try {
      const res = await firstValueFrom(this.http.get<{ items: unknown }>('/api/sites'));
      const current = this.session();
      if (current) this.remember({ ...current, sites: parseSites(res?.items) });
    } catch {
      // Keep the sites we know; the interceptor already reported offline or an ended session.
    }
  }

  private remember(session: RememberedSession): void {
    this.session.set(session);
    this.memory.write(SESSION_KEY, session);
  }

  private recall(): RememberedSession | null {
    const raw = this.memory.read(SESSION_KEY) as { user?: unknown; sites?: unknown } | null;
    const user = parseSessionUser(raw?.user);
    return user ? { user, sites: parseSites(raw?.sites) } : null;
  }
}
