import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { Capability } from '@shared/api/capabilities';
import type { Me } from '@shared/api/me';
import { LastVisit } from '../offline/last-visit';

/** The signed-in user, loaded once from `/api/me` and shared by the whole app. */
@Injectable({ providedIn: 'root' })
export class CurrentUser {
  private readonly http = inject(HttpClient);
  private readonly lastVisit = inject(LastVisit);
  private readonly state = signal<Me | null>(null);
  private loading: Promise<Me | null> | null = null;

  /** The user, or null before sign-in. */
  readonly me = this.state.asReadonly();
  readonly capabilities = computed(() => new Set<Capability>(this.state()?.capabilities ?? []));

  /** Whether the user's role grants a capability. */
  can(capability: Capability): boolean {
    return this.capabilities().has(capability);
  }

  /**
   * Loads the user; null when nobody is signed in. The user this device kept from the last visit
   * answers first when the session's cookie names them (the app paints without waiting for the
   * network); `/api/me` is asked every time and its answer replaces it, or, at 401, sends the
   * browser to sign in (the session-expired interceptor).
   */
  load(): Promise<Me | null> {
    if (!this.loading) {
      const live = this.fromServer();
      const loading = Promise.race([live, this.fromDevice().then((me) => me ?? live)]);
      this.loading = loading;
      // A failed read is asked again by the next caller.
      live.catch(() => {
        if (this.loading === loading) this.loading = null;
      });
    }
    return this.loading;
  }

  private fromServer(): Promise<Me | null> {
    // The schema is imported lazily so zod stays out of the initial bundle.
    return Promise.all([firstValueFrom(this.http.get('/api/me')), import('@shared/api/me')])
      .then(([body, { meSchema }]) => {
        const me = meSchema.parse(body);
        const shown = this.state();
        this.state.set(me);
        // Never another user's screen: the page painted for the kept user starts again.
        if (shown && shown.id !== me.id) location.reload();
        return me;
      })
      .catch((error: unknown) => {
        if (error instanceof HttpErrorResponse && error.status === 401) return null;
        throw error;
      });
  }

  /** The user kept on this device for the session's user, or null. */
  private async fromDevice(): Promise<Me | null> {
    const body = await this.lastVisit.userOfSession();
    if (body === undefined) return null;
    const { meSchema } = await import('@shared/api/me');
    const kept = meSchema.safeParse(body);
    if (!kept.success) return null;
    // The server's answer may already be in: it stands.
    if (this.state() === null) this.state.set(kept.data);
    return this.state();
  }

  /** Set once the user asks to sign out: the answers still in flight then are 401s by design. */
  private signingOut = false;

  /** Notes that the user is signing out, so no 401 sends them back to sign in. */
  markSigningOut(): void {
    this.signingOut = true;
  }

  /** Whether a 401 now means the session ran out, rather than the user signing out. */
  sessionExpired(): boolean {
    return this.state() !== null && !this.signingOut;
  }

  /** Sends the browser to sign in, coming back to the given path. */
  signIn(returnTo = location.pathname + location.search): void {
    location.assign(`/auth/sign-in?returnTo=${encodeURIComponent(returnTo)}`);
  }
}
