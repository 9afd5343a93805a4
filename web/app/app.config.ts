import {
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
  type ApplicationConfig,
  inject,
  provideAppInitializer,
} from '@angular/core';
import { provideHttpClient, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { provideRouter, withComponentInputBinding, withInMemoryScrolling } from '@angular/router';
import { routes } from './app.routes';
import { sessionExpiredInterceptor } from './core/auth/session-expired-interceptor';
import { AppUpdates } from './core/offline/app-updates';
import { lastVisitInterceptor } from './core/offline/last-visit-interceptor';
import { earlyReadsInterceptor } from './core/state/early-reads';
import { embeddedReadsInterceptor } from './core/state/embedded-reads';

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideZonelessChangeDetection(),
    provideHttpClient(
      withInterceptors([
        earlyReadsInterceptor,
        sessionExpiredInterceptor,
        lastVisitInterceptor,
        embeddedReadsInterceptor,
      ]),
      withXsrfConfiguration({}),
    ),
    provideRouter(
      routes,
      withComponentInputBinding(),
      withInMemoryScrolling({ scrollPositionRestoration: 'top' }),
    ),
    provideAppInitializer(() => inject(AppUpdates).start()),
  ],
};
