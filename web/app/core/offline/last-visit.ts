import { Injectable, signal } from '@angular/core';
import type { UseStore } from 'idb-keyval';
import { signedInCookieName } from '@shared/api/signed-in-cookie';

/** idb-keyval and the store, loaded on first use so neither weighs on the first screen. */
interface Keyval {
  lib: typeof import('idb-keyval');
  store: UseStore;
}

/** A response body kept from an earlier visit, and when it arrived. */
export interface KeptAnswer {
  body: unknown;
  keptAt: number;
}

/** The signed-in user as `/api/me` last answered, with their id. */
interface KeptUser {
  id: number;
  body: unknown;
}

const userKey = 'signed-in-user';

/** Settles when the browser is idle (`requestIdleCallback`, at most two seconds on), or soon. */
function whenIdle(): Promise<void> {
  return new Promise((resolve) =>
    typeof requestIdleCallback === 'function'
      ? requestIdleCallback(() => resolve(), { timeout: 2000 })
      : setTimeout(resolve, 0),
  );
}

/**
 * The user this browser's session belongs to, as the server names them in a cookie the page can
 * read (`tuttiboard.user`, set at sign-in and on `/api/me`, cleared at sign-out); null when none.
 */
export function sessionUserId(cookies = document.cookie): number | null {
  const pair = cookies
    .split(';')
    .map((cookie) => cookie.trim().split('='))
    .find(([name]) => name === signedInCookieName);
  return pair && /^\d+$/.test(pair[1] ?? '') ? Number(pair[1]) : null;
}

/**
 * What this device keeps of the signed-in user's last visit, in IndexedDB: the answers of the
 * reads a director or student needs with no network (their ensembles, students, the ladder,
 * pass-offs, their own progress). Every answer is kept under the user's id, a different user
 * signing in on the device clears what the last one left, and signing out clears it all.
 */
@Injectable({ providedIn: 'root' })
export class LastVisit {
  private keyval: Promise<Keyval | null> | null = null;
  private userId: number | null = null;
  /** Settles once the signed-in user is known and another user's answers are cleared. */
  private ready: Promise<void> = Promise.resolve();
  /** When the oldest answer shown this visit was kept, while answers come from the device. */
  readonly shownFrom = signal<number | null>(null);

  /** Notes who is signed in; another user's answers are cleared first. */
  signedIn(body: unknown): Promise<void> {
    const id = (body as { id?: unknown } | null)?.id;
    if (typeof id !== 'number') return this.ready;
    this.ready = this.ready.then(async () => {
      const db = await this.open();
      if (!db) return;
      const kept = await db.lib.get<KeptUser>(userKey, db.store).catch(() => undefined);
      if (kept && kept.id !== id) await db.lib.clear(db.store).catch(() => undefined);
      await db.lib.set(userKey, { id, body } satisfies KeptUser, db.store).catch(() => undefined);
      this.userId = id;
    });
    return this.ready;
  }

  /** The user `/api/me` last answered on this device, to open the app without a network. */
  async lastUser(): Promise<unknown> {
    await this.ready;
    const db = await this.open();
    const kept = db
      ? await db.lib.get<KeptUser>(userKey, db.store).catch(() => undefined)
      : undefined;
    if (!kept) return undefined;
    this.userId = kept.id;
    return kept.body;
  }

  /**
   * Keeps an answer for the signed-in user. Written when the page is next idle (within two
   * seconds): a large answer's copy into IndexedDB then neither holds up the screen drawing it
   * nor queues the device's reads of a first paint behind its write transaction.
   */
  async keep(url: string, body: unknown): Promise<void> {
    await whenIdle();
    await this.ready;
    const db = await this.open();
    if (!db || this.userId === null) return;
    await db.lib
      .set(this.key(url), { body, keptAt: Date.now() } satisfies KeptAnswer, db.store)
      .catch(() => undefined);
  }

  /** The answer kept for the signed-in user, if any, and notes that the page shows it. */
  async recall(url: string): Promise<KeptAnswer | undefined> {
    await this.ready;
    const db = await this.open();
    if (!db || this.userId === null) return undefined;
    const kept = await db.lib.get<KeptAnswer>(this.key(url), db.store).catch(() => undefined);
    if (kept) this.shownFrom.update((before) => Math.min(before ?? kept.keptAt, kept.keptAt));
    return kept;
  }

  /**
   * The user kept on this device, only when the session's cookie names that same user: what a
   * screen may paint before the server answers (the server's answer follows and decides).
   */
  async userOfSession(): Promise<unknown> {
    const id = sessionUserId();
    if (id === null) return undefined;
    await this.ready;
    const db = await this.open();
    const kept = db
      ? await db.lib.get<KeptUser>(userKey, db.store).catch(() => undefined)
      : undefined;
    if (kept?.id !== id) return undefined;
    this.userId ??= id;
    return kept.body;
  }

  /**
   * The answers kept for the user the session names, to paint before the server answers, read
   * in one IndexedDB transaction; each undefined when the device holds none, all when it holds
   * another user's. Not noted as shown from the device: the server's answers replace them (an
   * unreachable server is the interceptor's `recall`).
   */
  async keptForSession(urls: readonly string[]): Promise<unknown[]> {
    const none = urls.map(() => undefined);
    const id = sessionUserId();
    if (id === null) return none;
    const db = await this.open();
    if (!db) return none;
    const [user, ...kept] = await db.lib
      .getMany<unknown>([userKey, ...urls.map((url) => `${id} ${url}`)], db.store)
      .catch(() => [undefined, ...none]);
    if ((user as KeptUser | undefined)?.id !== id) return none;
    return kept.map((each) => (each as KeptAnswer | undefined)?.body);
  }

  /**
   * The body kept for the user last signed in on this device, as a hint only (how many rows a
   * list had): nothing is shown from it and no user is assumed signed in.
   */
  async hint(url: string): Promise<unknown> {
    const db = await this.open();
    if (!db) return undefined;
    const user = await db.lib.get<KeptUser>(userKey, db.store).catch(() => undefined);
    if (!user) return undefined;
    const kept = await db.lib.get<KeptAnswer>(`${user.id} ${url}`, db.store).catch(() => undefined);
    return kept?.body;
  }

  /** Notes that the server answered again, so the page no longer shows kept answers. */
  answeredLive(): void {
    if (this.shownFrom() !== null) this.shownFrom.set(null);
  }

  /** Forgets everything this device kept (signing out). */
  async forget(): Promise<void> {
    await this.ready;
    this.userId = null;
    this.shownFrom.set(null);
    const db = await this.open();
    if (db) await db.lib.clear(db.store).catch(() => undefined);
  }

  private key(url: string): string {
    // The same key as `hint` reads.
    return `${this.userId} ${url}`;
  }

  private open(): Promise<Keyval | null> {
    this.keyval ??=
      typeof indexedDB === 'undefined'
        ? Promise.resolve(null)
        : import('idb-keyval').then(
            (lib) => ({ lib, store: lib.createStore('tuttiboard-last-visit', 'answers') }),
            () => null,
          );
    return this.keyval;
  }
}
