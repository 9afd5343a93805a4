import { bootstrapApplication } from '@angular/platform-browser';
import { App } from './app/app';
import { appConfig } from './app/app.config';

// The app's Content-Security-Policy has no 'unsafe-eval', so zod must not compile its parsers
// with `new Function`; its `jitless` option makes it interpret them instead, and skips the probe
// a strict policy would report as a blocked eval. zod reads its options from this global object
// (zod 4, core.js) and is loaded only with the first screen, so it is set here, before any
// schema is built, without putting zod in the initial bundle.
(globalThis as { __zod_globalConfig?: { jitless: boolean } }).__zod_globalConfig = {
  jitless: true,
};

bootstrapApplication(App, appConfig).catch((error: unknown) => console.error(error));
