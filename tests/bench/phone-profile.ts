import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { buildWeb } from '../../scripts/build-web';
import type { Browser, BrowserContext, CDPSession, Page } from 'playwright-core';
import { startOidcFake } from '../../fakes/oidc/oidc-fake';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createHttpServer } from '../../server/core/http-server';
import { migrateDatabase, openDatabase } from '../../server/db/client';
import { createLogger } from '../../server/logger';
import { seedDemo } from '../../server/seed/demo';
import { appInstalledByWorker, launchBrowser, signInAs } from '../support/browser';
import { figure, round, type BenchFigure } from './bench-figure';

/**
 * Chromium DevTools' "Fast 3G" preset as Lighthouse defines its mobile throttling (from memory:
 * 150 ms round trip × 3.75 request latency, 1.6 Mbit/s down and 750 kbit/s up, each × 0.9).
 */
const fast3g = {
  offline: false,
  latency: 562.5,
  downloadThroughput: (1.6 * 1024 * 1024 * 0.9) / 8,
  uploadThroughput: (750 * 1024 * 0.9) / 8,
};
/** A mid-range phone's processor against a desktop's: Lighthouse's mobile CPU slowdown. */
const cpuSlowdown = 4;

/**
 * The targets, from web.dev's Core Web Vitals thresholds: LCP "good" under 2.5 s, INP "good"
 * under 200 ms (here half of it, 100 ms), and 1 s for a repeat visit answered by the service worker.
 */
const limits = { coldLcp: 2500, repeatLcp: 1000, tap: 100 };

interface Profile {
  name: string;
  phone: boolean;
}

interface Measured {
  coldLcp: number;
  repeatLcp: number;
  tap: number;
}

const emailOfDirector = 'director.hpms@merrowbasin.example';

/** The demo district served with the production build, and an identity provider to sign in. */
async function serveDemo() {
  if (!fs.existsSync('dist/web/browser/index.html')) {
    const built = buildWeb([], 'capture');
    if (built.status !== 0) throw new Error(`ng build failed:\n${built.stdout}\n${built.stderr}`);
  }
  const database = await openDatabase({ kind: 'pglite-memory' });
  await migrateDatabase(database);
  await seedDemo(database.db);
  const oidc = await startOidcFake({ port: 0 });
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-bench-phone-'));
  const config = loadConfig({
    LOG_LEVEL: 'silent',
    TUTTI_DATA_DIR: dataDir,
    OIDC_ISSUER: oidc.issuer,
    SMTP_URL: 'smtp://127.0.0.1:9',
  });
  const app = await createApp(config, { database, logger: createLogger('silent'), serveWeb: true });
  const server = createHttpServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const ensembles = database.pglite
    ? ((
        await database.pglite.query<{ id: number }>(
          `select e.id from ensembles e join schools s on s.id = e.school_id
           where s.code = 'HPMS' order by e.name limit 1`,
        )
      ).rows as { id: number }[])
    : [];
  return {
    url,
    sheetPath: `/pass-offs?ensemble=${ensembles[0]!.id}&rung=1`,
    close: async () => {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await (app.locals['stop'] as (() => Promise<void>) | undefined)?.();
      await oidc.close();
      await database.close();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** The page's Largest Contentful Paint so far, in ms from navigation start (buffered entries). */
function largestContentfulPaint(page: Page): Promise<number> {
  return page.evaluate(
    () =>
      new Promise<number>((resolve) => {
        new PerformanceObserver((list) => {
          const entries = list.getEntries();
          resolve(entries[entries.length - 1]!.startTime);
        }).observe({ type: 'largest-contentful-paint', buffered: true });
      }),
  );
}

/** What a director needs to start: the grid's first row on a desktop, the first scale's card by touch. */
const entrySelector = (phone: boolean) =>
  phone ? '[data-testid=touch-scale]' : '[role=row][row-index="0"] [role=gridcell]';

/**
 * Notes, in every page of the context, the time of the first frame drawn after the entry's first
 * element appeared (a MutationObserver, then requestAnimationFrame's timestamp): the paint of the
 * content itself, which LCP may not pick when a larger heading is drawn earlier.
 */
async function noteEntryPaint(context: BrowserContext, phone: boolean): Promise<void> {
  await context.addInitScript((selector: string) => {
    const held = window as unknown as { tbEntryPainted?: number };
    const observer = new MutationObserver(() => {
      if (!document.querySelector(selector)) return;
      observer.disconnect();
      requestAnimationFrame((frame) => {
        held.tbEntryPainted = frame;
      });
    });
    observer.observe(document, { childList: true, subtree: true });
  }, entrySelector(phone));
}

/**
 * Opens the pass-off sheet and answers when it was usable, in ms from navigation start: its LCP,
 * or the first frame with the entry's first element if that came later (the heading above the
 * entry can be the largest paint, and must not stand for the entry).
 */
async function openSheet(page: Page, url: string, phone: boolean): Promise<number> {
  await page.goto(url, { waitUntil: 'commit' });
  await page.locator(entrySelector(phone)).first().waitFor({ timeout: 120_000 });
  // Two frames, so the row that just appeared has been painted and reported.
  await page.evaluate(
    () => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))),
  );
  const entryPainted = await page.evaluate(
    () => (window as unknown as { tbEntryPainted?: number }).tbEntryPainted ?? 0,
  );
  return Math.max(await largestContentfulPaint(page), entryPainted);
}

/**
 * A tap (or click) on a pass-off cell, timed as Interaction to Next Paint times it: the Event
 * Timing API's duration of the interaction's slowest event, from input to the next frame painted.
 */
async function tapToPaint(page: Page, phone: boolean, row: number): Promise<number> {
  await page.evaluate(() => {
    const held = window as unknown as { tbEvents: number[] };
    held.tbEvents = [];
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) {
        if ((entry as PerformanceEntry & { interactionId?: number }).interactionId)
          held.tbEvents.push(entry.duration);
      }
    }).observe({
      type: 'event',
      durationThreshold: 16,
      buffered: false,
    } as PerformanceObserverInit);
  });
  // On a phone the touch entry: a tempo preset of the first scale's card (one tap records it).
  if (phone) await page.locator('[data-testid=touch-scale] button.tempo').nth(row).tap();
  else await page.locator(`[role=row][row-index="${row}"] [role=gridcell]`).nth(1).click();
  await page.evaluate(
    () => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))),
  );
  await page.waitForTimeout(300);
  const durations = await page.evaluate(
    () => (window as unknown as { tbEvents: number[] }).tbEvents,
  );
  // Entries under the 16 ms threshold are not reported: the interaction painted within a frame.
  return durations.length ? Math.max(...durations) : 16;
}

async function throttle(session: CDPSession, on: boolean): Promise<void> {
  await session.send('Emulation.setCPUThrottlingRate', { rate: on ? cpuSlowdown : 1 });
  await session.send('Network.enable');
  await session.send(
    'Network.emulateNetworkConditions',
    on ? fast3g : { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 },
  );
}

/** Waits until the service worker controls the page and has installed the app's files. */
async function waitForServiceWorker(page: Page): Promise<void> {
  const deadline = Date.now() + 180_000;
  while (!(await appInstalledByWorker(page))) {
    if (Date.now() > deadline) throw new Error('The service worker did not install the app.');
    await page.waitForTimeout(1000);
  }
}

async function measure(browser: Browser, appUrl: string, sheetPath: string, profile: Profile) {
  const context: BrowserContext = await browser.newContext(
    profile.phone
      ? {
          // A phone's screen, processor and network (the touch entry, one student at a time).
          viewport: { width: 390, height: 844 },
          deviceScaleFactor: 2,
          isMobile: true,
          hasTouch: true,
        }
      : { viewport: { width: 1360, height: 860 } },
  );
  await noteEntryPaint(context, profile.phone);
  const page = await context.newPage();
  const session = await context.newCDPSession(page);
  await signInAs(page, appUrl, emailOfDirector);
  // Cold: nothing of the app in the HTTP cache and no service worker yet.
  await page.goto(`${appUrl}/signed-out`);
  await session.send('Network.enable');
  await session.send('Network.clearBrowserCache');
  await session.send('Storage.clearDataForOrigin', {
    origin: appUrl,
    storageTypes: 'service_workers,cache_storage',
  });
  await page.goto('about:blank');
  await throttle(session, profile.phone);
  const coldLcp = await openSheet(page, `${appUrl}${sheetPath}`, profile.phone);
  const tap = await tapToPaint(page, profile.phone, 1);
  // The worker installs the app's files in the background; the repeat visit is answered by it.
  await throttle(session, false);
  await waitForServiceWorker(page);
  await page.goto('about:blank');
  await throttle(session, profile.phone);
  const repeatLcp = await openSheet(page, `${appUrl}${sheetPath}`, profile.phone);
  await context.close();
  return { coldLcp, repeatLcp, tap } satisfies Measured;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

/**
 * The pass-off screen on a mid-range phone profile (CPU ×4, "Fast 3G") through the DevTools
 * protocol: LCP on a cold load and on a repeat visit from the service worker, and a tap on a
 * cell to the next paint, each against its limit and beside the unthrottled desktop profile
 * measured in the same run.
 */
export async function benchPhoneProfile(options: { runs: number }): Promise<BenchFigure[]> {
  const served = await serveDemo();
  const browser = await launchBrowser();
  try {
    const runs = async (profile: Profile) => {
      const results: Measured[] = [];
      for (let run = 0; run < options.runs; run += 1)
        results.push(await measure(browser, served.url, served.sheetPath, profile));
      return {
        coldLcp: median(results.map((result) => result.coldLcp)),
        repeatLcp: median(results.map((result) => result.repeatLcp)),
        tap: median(results.map((result) => result.tap)),
      };
    };
    const desktop = await runs({ name: 'desktop', phone: false });
    const phone = await runs({ name: 'phone', phone: true });
    const beside = (phoneMs: number, desktopMs: number) =>
      `desktop unthrottled ${round(desktopMs)} ms (phone ${round(phoneMs / Math.max(desktopMs, 1))}× desktop)`;
    return [
      figure(
        'pass-offs LCP, cold, phone profile',
        phone.coldLcp,
        limits.coldLcp,
        `limit 2.5 s; LCP, or the entry's first paint if later; 390×844; ${beside(phone.coldLcp, desktop.coldLcp)}`,
      ),
      figure(
        'pass-offs LCP, repeat visit (service worker), phone profile',
        phone.repeatLcp,
        limits.repeatLcp,
        `limit 1 s; the app's files installed by the worker first; ${beside(phone.repeatLcp, desktop.repeatLcp)}`,
      ),
      figure(
        'tap on a cell to next paint, phone profile',
        phone.tap,
        limits.tap,
        `limit 100 ms; ${beside(phone.tap, desktop.tap)}`,
      ),
    ];
  } finally {
    await browser.close();
    await served.close();
  }
}
