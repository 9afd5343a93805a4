import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { Capability } from '@shared/api/capabilities';
import type { Me } from '@shared/api/me';

/** The signed-in user, loaded once from `/api/me` and shared by the whole app. */
@Injectable({ providedIn: 'root' })
export class CurrentUser {
  private readonly http = inject(HttpClient);
  private readonly state = signal<Me | null>(null);
  private loading: Promise<Me | null> | null = null;

  /** The user, or null before sign-in. */
  readonly me = this.state.asReadonly();
  readonly capabilities = computed(() => new Set<Capability>(this.state()?.capabilities ?? []));

  /** Whether the user's role grants a capability. */
  can(capability: Capability): boolean {
    return this.capabilities().has(capability);
  }

  /** Loads the user; null when nobody is signed in. */
  load(): Promise<Me | null> {
    // The schema is imported lazily so zod stays out of the initial bundle.
    this.loading ??= Promise.all([
      firstValueFrom(this.http.get('/api/me')),
      import('@shared/api/me'),
    ])
      .then(([body, { meSchema }]) => {
        const me = meSchema.parse(body);
        this.state.set(me);
        return me;
      })
      .catch((error: unknown) => {
        this.loading = null;
        if (error instanceof HttpErrorResponse && error.status === 401) return null;
        throw error;
      });
    return this.loading;
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
