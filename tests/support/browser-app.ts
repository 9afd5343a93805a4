import { afterAll, beforeAll } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { demoEmail, startTestApp, type TestApp } from './test-app';
import { launchBrowser, localOnlyContext, signInAs } from './browser';

/** The app serving the web build, and a browser, for the tests of one file. */
export interface BrowserApp {
  readonly app: TestApp;
  readonly browser: Browser;
  /**
   * A new page in a local-only context (see `localOnlyContext`), at the viewport asked for,
   * signed in as the demo user with this e-mail local part (`'director.hpms'`) and opened at `path`.
   */
  signedInPage(
    local: string,
    options?: { path?: string; viewport?: { width: number; height: number } },
  ): Promise<{ context: BrowserContext; page: Page; outside: string[] }>;
}

/**
 * Starts the whole app with its web build and a browser before the file's tests and closes both
 * after them. Call it at the top of a test file.
 */
export function useBrowserApp(): BrowserApp {
  let app: TestApp | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    [app, browser] = await Promise.all([startTestApp({ serveWeb: true }), launchBrowser()]);
  });
  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });
  const started = <T>(value: T | undefined): T => {
    if (value === undefined)
      throw new Error('The app and browser start in beforeAll; use them inside a test.');
    return value;
  };
  return {
    get app() {
      return started(app);
    },
    get browser() {
      return started(browser);
    },
    async signedInPage(local, options = {}) {
      const { context, outside } = await localOnlyContext(started(browser));
      const page = await context.newPage();
      if (options.viewport) await page.setViewportSize(options.viewport);
      await signInAs(page, started(app).url, demoEmail(local), options.path);
      return { context, page, outside };
    },
  };
}
