import fs from 'node:fs';
import path from 'node:path';
import {
  chromium,
  type Browser,
  type BrowserContext,
  type BrowserContextOptions,
  type Page,
} from 'playwright-core';

export const chromiumPath = process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium';

/** Where the browser suite saves what a user sees; the README shows some of these. */
export const screenshotFolder = path.resolve('docs/screenshots');

/** Debian's Chromium, headless, with the flags that keep it from calling out. */
export async function launchBrowser(): Promise<Browser> {
  if (!fs.existsSync(chromiumPath)) {
    throw new Error(
      `Chromium is not installed at ${chromiumPath}. Install it with: apt-get install -y chromium`,
    );
  }
  return chromium.launch({
    executablePath: chromiumPath,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--no-first-run',
      '--disable-sync',
      '--disable-quic',
    ],
  });
}

/**
 * A browser context that lets requests reach only this machine and records any that tried to
 * go elsewhere, so a test can prove nothing leaves the machine.
 */
export async function localOnlyContext(
  browser: Browser,
  options: BrowserContextOptions = {},
): Promise<{ context: BrowserContext; outside: string[] }> {
  const context = await browser.newContext({
    viewport: { width: 1360, height: 860 },
    locale: 'en-US',
    timezoneId: 'America/Los_Angeles',
    ...options,
  });
  const outside: string[] = [];
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url());
    if (
      ['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname) ||
      url.protocol === 'data:' ||
      url.protocol === 'blob:'
    ) {
      return route.continue();
    }
    outside.push(url.href);
    return route.abort();
  });
  return { context, outside };
}

/** Signs in through the identity provider's page by choosing the demo account. */
export async function signInAs(page: Page, appUrl: string, email: string, path = '/') {
  await page.goto(`${appUrl}${path}`);
  await page.locator(`button.account[value="${email}"]`).click();
  await page.waitForURL((url) => url.origin === appUrl && !url.pathname.startsWith('/auth'));
}

/** Saves a full-page screenshot under docs/screenshots. */
export async function saveScreenshot(page: Page, name: string) {
  fs.mkdirSync(screenshotFolder, { recursive: true });
  await page.screenshot({ path: path.join(screenshotFolder, `${name}.png`), fullPage: false });
}

/**
 * Waits for a dialog that was just opened to take the focus. Angular Material moves the focus
 * into a dialog (its `autoFocus`, by default the first field) only once the opening animation
 * has ended, so text typed before then can end up in the first field instead of the one meant
 * (seen once on a slow machine: the e-mail address typed into the name field).
 */
export async function dialogReady(page: Page) {
  await page.waitForFunction(() =>
    Boolean(document.activeElement?.closest('mat-dialog-container')),
  );
}

/**
 * Opens a Material select and picks an option. A select whose options have not arrived yet
 * does not open on a click, so this tries again until the option shows (or 30 s pass).
 */
export async function chooseOption(page: Page, selectTestId: string, option: string | RegExp) {
  const wanted = page.getByRole('option', { name: option });
  const deadline = Date.now() + 30_000;
  for (;;) {
    await page.getByTestId(selectTestId).click();
    try {
      await wanted.first().waitFor({ state: 'visible', timeout: 1_500 });
      break;
    } catch (error) {
      if (Date.now() > deadline) throw error;
      await page.keyboard.press('Escape');
    }
  }
  await wanted.first().click();
}

/** The data block of answers the index page is served with for a signed-in user. */
export const embeddedBlock =
  /<script type="application\/json" id="tb-embedded-reads">.*?<\/script>/s;

/**
 * Serves the pass-off page as the service worker's copy of the index page is: without the answers
 * a signed-in navigation is served with, so the screen's reads start as the route matches.
 */
export async function serveIndexAsWorkerKeepsIt(page: Page): Promise<void> {
  await page.route(/\/pass-offs\?/, async (route) => {
    if (route.request().resourceType() !== 'document') return route.fallback();
    const response = await route.fetch();
    const body = (await response.text()).replace(embeddedBlock, '');
    await route.fulfill({ response, body });
  });
}

/**
 * Whether the service worker controls the page and holds every file of its prefetched asset
 * groups (ngsw.json's `installMode: "prefetch"`) in Cache Storage. Angular's worker takes control
 * as soon as it activates and fetches those files afterwards (on a localhost scope, inside the
 * first fetch it handles: the manifest asked for here), so control alone does not mean the app
 * opens offline yet.
 */
export function appInstalledByWorker(page: Page): Promise<boolean> {
  return page.evaluate(async () => {
    if (navigator.serviceWorker.controller === null) return false;
    const manifest = (await (await fetch('/ngsw.json', { cache: 'no-store' })).json()) as {
      assetGroups: { installMode: string; urls: string[] }[];
    };
    const urls = manifest.assetGroups
      .filter((group) => group.installMode === 'prefetch')
      .flatMap((group) => group.urls);
    const cached = await Promise.all(urls.map((url) => caches.match(url)));
    return cached.every((response) => response !== undefined);
  });
}
