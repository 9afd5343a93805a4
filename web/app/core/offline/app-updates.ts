import {
  ApplicationRef,
  EnvironmentInjector,
  Injectable,
  inject,
  isDevMode,
  signal,
} from '@angular/core';

/** The service worker's script, emitted at the root of a production build by Angular's builder. */
export const serviceWorkerScript = 'ngsw-worker.js';

/**
 * Whether a new version of the app is ready, and the start of the service worker that brings it.
 * The worker and Angular's `SwUpdate` are loaded once the first screen is up (or after 30 s, as
 * Angular's own `registerWhenStable:30000`), so neither weighs on the first screen's bundle.
 */
@Injectable({ providedIn: 'root' })
export class AppUpdates {
  private readonly appRef = inject(ApplicationRef);
  private readonly injector = inject(EnvironmentInjector);
  /** Whether a new version is downloaded and a reload would load it. */
  readonly ready = signal(false);

  /** Registers the service worker in production builds; development and unit specs go without. */
  start(): void {
    if (isDevMode() || !('serviceWorker' in navigator)) return;
    const later = new Promise((resolve) => setTimeout(resolve, 30_000));
    void Promise.race([this.appRef.whenStable(), later])
      .then(() => import('./service-worker-start'))
      .then(({ startServiceWorker }) =>
        startServiceWorker(this.injector, () => this.ready.set(true)),
      )
      .catch((error: unknown) => console.error('The service worker could not start.', error));
  }
}
