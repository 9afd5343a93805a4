import { beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { demoEmail, type SignedInClient } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import {
  appInstalledByWorker,
  localOnlyContext,
  saveScreenshot,
  signInAs,
} from '../support/browser';
import type { EnsembleDetail } from '@shared/api/ensemble';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import { findInstrument } from '@shared/music/index';

const e2e = useBrowserApp();
let director: SignedInClient;
let ladder: Ladder;

const patient = { timeout: 30_000 };
/** How long a test waits for the service worker, and the longer limit of the tests that do. */
const workerWaitMs = 120_000;
const waitsForWorker = workerWaitMs + 90_000;

/** An ensemble, a rung and one of its scales asked of at least ten of the ensemble's students. */
interface Sheet {
  ensembleId: number;
  rung: number;
  requirement: LadderRequirement;
  /** Grid rows (active seats in the ensemble's order, one per student) the scale is asked of. */
  rows: number[];
  studentIds: number[];
}

async function sheetWithTenStudents(): Promise<Sheet> {
  const ensembles = (await director.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as {
    id: number;
  }[];
  for (const ensemble of ensembles) {
    const detail = (await director.get(`/api/ensembles/${ensemble.id}`)).body as EnsembleDetail;
    const seen = new Set<number>();
    const members = detail.members.filter(
      (member) => member.active && !seen.has(member.studentId) && seen.add(member.studentId),
    );
    if (members.length < 11) continue;
    const families = members.map((member) =>
      member.instrumentId ? (findInstrument(member.instrumentId)?.family ?? null) : null,
    );
    const rung = ladder.rungs[1]!;
    for (const requirement of rung.requirements) {
      const rows = families.flatMap((family, index) =>
        !requirement.families ||
        (family !== null && (requirement.families as string[]).includes(family))
          ? [index]
          : [],
      );
      if (rows.length >= 11) {
        const chosen = rows.slice(0, 10);
        return {
          ensembleId: ensemble.id,
          rung: rung.number,
          requirement,
          rows: chosen,
          studentIds: chosen.map((row) => members[row]!.studentId),
        };
      }
    }
  }
  throw new Error('No Heron Point ensemble has ten students asked one rung-2 scale.');
}

function cell(page: Page, rowIndex: number, colId: string) {
  return page.locator(`[role=row][row-index="${rowIndex}"] [role=gridcell][col-id="${colId}"]`);
}

/**
 * Waits until Angular's service worker controls the page and has installed the app's files. It
 * registers once the app is stable and takes control as it activates, then fetches the app's files
 * (on a localhost scope inside the first fetch it handles; on a loaded machine the whole has taken
 * over a minute); a page loaded before the activation is not always claimed by it, so the page is
 * loaded again once the worker is active, as the user's next visit would be.
 */
async function controlledByServiceWorker(page: Page) {
  await expect
    .poll(
      () =>
        page.evaluate(async () => {
          const registration = await navigator.serviceWorker.getRegistration();
          return registration?.active?.state ?? 'none';
        }),
      { timeout: workerWaitMs, interval: 500 },
    )
    .toBe('activated');
  if (await page.evaluate(() => navigator.serviceWorker.controller === null)) await page.reload();
  // Controlled, and the app's files kept: only then does it open with no network.
  await expect
    .poll(() => appInstalledByWorker(page), { timeout: 30_000, interval: 500 })
    .toBe(true);
}

async function ensembleTotal(sheet: Sheet): Promise<PassOff[]> {
  const response = await director.get(
    `/api/pass-offs?ensembleId=${sheet.ensembleId}&requirementCode=${sheet.requirement.code}&limit=1000`,
  );
  expect(response.body.total).toBeLessThan(1000);
  return response.body.rows as PassOff[];
}

async function phoneContext(): Promise<BrowserContext> {
  return e2e.browser.newContext({
    viewport: { width: 390, height: 844 },
    deviceScaleFactor: 2,
    isMobile: true,
    hasTouch: true,
    locale: 'en-US',
    timezoneId: 'America/Los_Angeles',
  });
}

beforeAll(async () => {
  director = await e2e.app.signIn(demoEmail('director.hpms'));
  ladder = (await director.get('/api/ladder')).body as Ladder;
});

describe('With no network', () => {
  it(
    'should open the pass-off screen offline after a visit, take ten pass-offs, and record exactly ten when the network returns',
    async () => {
      const sheet = await sheetWithTenStudents();
      const before = await ensembleTotal(sheet);
      const { context, outside } = await localOnlyContext(e2e.browser);
      const page = await context.newPage();
      await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
      const sheetUrl = `${e2e.app.url}/pass-offs?ensemble=${sheet.ensembleId}&rung=${sheet.rung}`;
      await page.goto(sheetUrl);
      await expect.poll(() => cell(page, 0, sheet.requirement.code).count(), patient).toBe(1);
      await controlledByServiceWorker(page);

      await context.setOffline(true);
      await page.reload();
      await expect.poll(() => page.getByTestId('offline-banner').count(), patient).toBe(1);
      await expect.poll(() => cell(page, 0, sheet.requirement.code).count(), patient).toBe(1);
      expect(await page.getByTestId('offline-banner').innerText()).toContain(
        'New pass-offs wait on this device and are sent when the network returns',
      );

      await cell(page, 0, sheet.requirement.code).click();
      await page.mouse.move(1, 1);
      const last = sheet.rows.at(-1)!;
      for (let row = 0; row <= last; row++) {
        if (sheet.rows.includes(row)) await page.keyboard.press('n');
        await page.keyboard.press(row < last ? 'ArrowDown' : 'ArrowUp');
      }
      await expect
        .poll(() => page.getByTestId('queue-banner').innerText(), patient)
        .toContain('10 entries waiting to be saved');
      expect(await cell(page, last, sheet.requirement.code).innerText()).toContain(
        'waiting to send',
      );
      // The page scrolls as the focus moves down the grid; the strip sits at its top.
      await page.evaluate(() => window.scrollTo(0, 0));
      await saveScreenshot(page, 'offline-pass-offs');
      expect((await ensembleTotal(sheet)).length).toBe(before.length);

      await context.setOffline(false);
      await expect.poll(() => page.getByTestId('queue-banner').count(), patient).toBe(0);
      await expect
        .poll(async () => (await ensembleTotal(sheet)).length, patient)
        .toBe(before.length + 10);
      // A moment later nothing more has arrived: each entry was sent exactly once.
      await page.waitForTimeout(1500);
      const after = await ensembleTotal(sheet);
      const created = after.filter(
        (passOff) => !before.some((earlier) => earlier.id === passOff.id),
      );
      expect(created).toHaveLength(10);
      expect(new Set(created.map((passOff) => passOff.clientKey)).size).toBe(10);
      expect(created.map((passOff) => passOff.studentId).sort()).toEqual(
        [...sheet.studentIds].sort(),
      );
      expect(created.every((passOff) => !passOff.passed && passOff.heardByName !== null)).toBe(
        true,
      );
      expect(outside).toEqual([]);
      await context.close();
    },
    waitsForWorker,
  );

  it(
    'should open a student’s own page and practice sheets on a phone offline, and forget them at sign-out',
    async () => {
      const context = await phoneContext();
      const page = await context.newPage();
      await signInAs(page, e2e.app.url, demoEmail('student.hpms'));
      await expect.poll(() => page.getByTestId('progress-rung').count(), patient).toBe(1);
      const rungText = await page.getByTestId('progress-rung').innerText();
      const ownPage = page.url();
      await page.goto(`${e2e.app.url}/practice`);
      await expect.poll(() => page.locator('h1').innerText(), patient).toContain('Practice');
      await controlledByServiceWorker(page);

      await context.setOffline(true);
      await page.goto(ownPage);
      await expect.poll(() => page.getByTestId('offline-banner').count(), patient).toBe(1);
      await expect
        .poll(() => page.getByTestId('progress-rung').innerText(), patient)
        .toBe(rungText);
      await saveScreenshot(page, 'offline-student-page-phone');
      await page.goto(`${e2e.app.url}/practice`);
      await expect.poll(() => page.locator('h1').innerText(), patient).toContain('Practice');
      await expect.poll(() => page.locator('tb-staff svg').count(), patient).toBeGreaterThan(0);

      await context.setOffline(false);
      const kept = () =>
        page.evaluate(
          () =>
            new Promise<number>((resolve) => {
              const open = indexedDB.open('tuttiboard-last-visit');
              open.onsuccess = () => {
                const db = open.result;
                if (!db.objectStoreNames.contains('answers')) return resolve(0);
                const count = db.transaction('answers').objectStore('answers').count();
                count.onsuccess = () => resolve(count.result);
              };
            }),
        );
      expect(await kept()).toBeGreaterThan(0);
      // The form's own button, wherever the layout puts it on a phone.
      await page
        .locator('form[action="/auth/sign-out"] button[type=submit]')
        .dispatchEvent('click');
      await page.waitForURL((url) => !url.pathname.startsWith('/practice'));
      await page.goto(`${e2e.app.url}/signed-out`);
      expect(await kept()).toBe(0);
      await context.close();
    },
    waitsForWorker,
  );

  it('should say how many pass-offs are unsent and ask before signing out', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.qhms'));
    const me = (await page.evaluate(() =>
      fetch('/api/me').then((response) => response.json()),
    )) as {
      id: number;
    };
    await page.evaluate(
      ({ id }) =>
        localStorage.setItem(
          `tuttiboard.pass-off-queue.${id}`,
          JSON.stringify([{ clientKey: crypto.randomUUID() }, { clientKey: crypto.randomUUID() }]),
        ),
      me,
    );
    await page.locator('form[action="/auth/sign-out"] button[type=submit]').dispatchEvent('click');
    const dialog = page.getByRole('dialog');
    await expect.poll(() => dialog.count(), patient).toBe(1);
    expect(await dialog.innerText()).toContain('Sign out with 2 pass-offs not sent?');
    await saveScreenshot(page, 'sign-out-unsent');
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await expect.poll(() => dialog.count(), patient).toBe(0);
    expect(page.url()).not.toContain('signed-out');
    expect(await page.evaluate(() => fetch('/api/me').then((response) => response.status))).toBe(
      200,
    );
    await context.close();
  });

  it('should have every version-naming file checked with the server, and the hashed files kept', async () => {
    // Angular's service worker guide: ngsw.json and the worker script must not be served stale.
    for (const file of ['/ngsw.json', '/ngsw-worker.js', '/manifest.webmanifest', '/index.html']) {
      const response = await e2e.app.anonymous.get(file);
      expect(response.status, file).toBe(200);
      expect(response.headers['cache-control'], file).toBe('no-cache');
    }
    const manifest = JSON.parse((await e2e.app.anonymous.get('/manifest.webmanifest')).text) as {
      icons: { src: string; sizes: string }[];
    };
    expect(manifest.icons.map((icon) => icon.sizes)).toEqual(
      expect.arrayContaining(['192x192', '512x512']),
    );
    const worker = (await e2e.app.anonymous.get('/ngsw.json')).body as { hashTable: object };
    const main = Object.keys(worker.hashTable).find((file) => /^\/main-\w+\.js$/.test(file))!;
    expect(main).toBeDefined();
    // RFC 8246: a file whose name carries its content's hash never changes, so it is immutable;
    // the chunk optimizer's chunks too (their hashes are base64url: letters of both cases, - and _).
    const chunks = Object.keys(worker.hashTable).filter((file) => /^\/chunk-.+\.js$/.test(file));
    expect(chunks.length).toBeGreaterThan(0);
    for (const file of [main, ...chunks])
      expect((await e2e.app.anonymous.get(file)).headers['cache-control'], file).toBe(
        'public, max-age=31536000, immutable',
      );
    // RFC 9110 §12.5.3: the browser's Accept-Encoding is answered with a coding it named.
    const coded = await e2e.app.anonymous.get(main).set('Accept-Encoding', 'br');
    expect(coded.headers['content-encoding']).toBe('br');
    expect(coded.headers['vary']).toMatch(/accept-encoding/i);
  });
});
