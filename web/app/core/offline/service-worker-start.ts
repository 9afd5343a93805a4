import { createEnvironmentInjector, type EnvironmentInjector } from '@angular/core';
import { SwUpdate, provideServiceWorker } from '@angular/service-worker';
import { filter, merge } from 'rxjs';
import { serviceWorkerScript } from './app-updates';

/**
 * Registers Angular's service worker and calls `onNewVersion` when `SwUpdate` reports a new
 * version ready (or the running one broken beyond repair). Loaded lazily by `AppUpdates`: the
 * providers go in an injector of their own, and the registration is the one Angular's
 * `provideServiceWorker` initializer makes (`navigator.serviceWorker.register`, and the
 * INITIALIZE message to a new controller), since initializers run only at bootstrap.
 */
export async function startServiceWorker(
  parent: EnvironmentInjector,
  onNewVersion: () => void,
): Promise<void> {
  const worker = navigator.serviceWorker;
  worker.addEventListener('controllerchange', () =>
    worker.controller?.postMessage({ action: 'INITIALIZE' }),
  );
  await worker.register(serviceWorkerScript);
  const injector = createEnvironmentInjector(
    [provideServiceWorker(serviceWorkerScript, { enabled: true })],
    parent,
  );
  const updates = injector.get(SwUpdate);
  merge(
    updates.versionUpdates.pipe(filter((event) => event.type === 'VERSION_READY')),
    updates.unrecoverable,
    // The service worker's version events are a stream, for the life of the app.
  ).subscribe(onNewVersion);
}
