import { describe, expect, it } from 'vitest';
import type { Page, Route } from 'playwright-core';
import { demoEmail } from '../support/test-app';
import type { EnsembleDetail } from '@shared/api/ensemble';
import { saveScreenshot, serveIndexAsWorkerKeepsIt, signInAs } from '../support/browser';
import { touchContext, useSmallScreens } from './small-screens-app';

const started = useSmallScreens();
const patient = { timeout: 30_000 };

/** The screen's reads of the server, held until released (the page's own, not the worker's). */
const screenReads = /\/api\/(me|ensembles|ladder|pass-offs|analytics\/students)(\?|\/|$)/;

/**
 * Holds the screen's GET reads at the browser until `release()`: the page can paint only from
 * what the device kept meanwhile.
 */
async function holdReads(page: Page) {
  let release!: () => void;
  const released = new Promise<void>((resolve) => (release = resolve));
  let held = 0;
  const handler = async (route: Route) => {
    if (route.request().method() !== 'GET') return route.continue().catch(() => undefined);
    held += 1;
    await released;
    await route.continue().catch(() => undefined);
  };
  await page.route(screenReads, handler);
  return {
    held: () => held,
    release: async () => {
      release();
      await page.unroute(screenReads, handler);
    },
  };
}

/** A phone with no service worker, so every read the page makes is the page's own. */
const phone = () => touchContext(started.browser, { width: 390, height: 844 }, 2, 'block');

/**
 * Holds the screen's reads and serves the page as the worker keeps it (a repeat visit's page has
 * no answers in it), so the first paint can come only from the device's copy.
 */
async function repeatVisitOf(page: Page) {
  const reads = await holdReads(page);
  await serveIndexAsWorkerKeepsIt(page);
  return reads;
}

describe('A repeat visit to the pass-off screen', () => {
  it('should paint from the device copy before the server answers, then show the server answer', async () => {
    const { app } = started;
    const director = await app.signIn(demoEmail('director.hpms'));
    const ensembles = (await director.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as {
      id: number;
    }[];
    const ensembleId = ensembles[0]!.id;
    const detail = (await director.get(`/api/ensembles/${ensembleId}`)).body as EnsembleDetail;
    const first = detail.members.find((member) => member.active)!;
    const firstStudent = first.studentId;
    const context = await phone();
    const page = await context.newPage();
    await signInAs(page, app.url, demoEmail('director.hpms'));
    const sheetUrl = `${app.url}/pass-offs?ensemble=${ensembleId}&rung=1`;
    await page.goto(sheetUrl);
    const asked = page.locator('[data-testid=touch-scale]:has(button.tempo)').first();
    await asked.waitFor(patient);
    await page.waitForLoadState('networkidle');
    const code = (await asked.getAttribute('data-code'))!;
    const card = page.locator(`[data-testid=touch-scale][data-code="${code}"]`);
    const keptState = await card.getByTestId('touch-state').innerText();
    // The device keeps the answers once the page is idle (IndexedDB, within two seconds each).
    await page.waitForTimeout(3000);

    // Meanwhile, another device records a pass-off of this cell on the server.
    const heardOn = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    const recorded = await director.post('/api/pass-offs', {
      passOffs: [
        { studentId: firstStudent, requirementCode: code, heardOn, tempo: 87, passed: true },
      ],
    });
    expect(recorded.status).toBe(201);

    const reads = await repeatVisitOf(page);
    await page.goto(sheetUrl);
    // Painted with every read still held: the copy of the last visit, as it stood then.
    await card.waitFor(patient);
    expect(await card.getByTestId('touch-state').innerText()).toBe(keptState);
    expect(reads.held()).toBeGreaterThan(0);
    await saveScreenshot(page, 'pass-offs-phone-repeat-visit-from-device');
    await reads.release();
    // The server's answer replaces it: the later pass-off shows.
    await expect
      .poll(() => card.getByTestId('touch-state').innerText(), patient)
      .toContain('On record: passed at ♩ = 87');
    // Still the same student on screen.
    expect(await page.getByTestId('touch-student-name').innerText()).toBe(
      `${first.preferredName ?? first.firstName} ${first.lastName}`,
    );
    await context.close();
  });

  it('should not paint a copy the device kept when the session belongs to another user', async () => {
    const { app } = started;
    const director = await app.signIn(demoEmail('director.hpms'));
    const ensembleId = (
      (await director.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as { id: number }[]
    )[0]!.id;
    const context = await phone();
    const page = await context.newPage();
    await signInAs(page, app.url, demoEmail('director.hpms'));
    const sheetUrl = `${app.url}/pass-offs?ensemble=${ensembleId}&rung=1`;
    await page.goto(sheetUrl);
    await page.locator('[data-testid=touch-scale]').first().waitFor(patient);
    await page.waitForLoadState('networkidle');
    await page.waitForTimeout(3000);

    // The browser's session now names someone else (as after another user signs in here).
    const me = (await director.get('/api/me')).body as { id: number };
    await context.addCookies([{ name: 'tuttiboard.user', value: String(me.id + 1), url: app.url }]);
    const reads = await repeatVisitOf(page);
    await page.goto(sheetUrl, { waitUntil: 'commit' });
    // Longer than the copy took to paint in the test above, with every read held the same way.
    await page.waitForTimeout(4000);
    expect(reads.held()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=touch-scale]').count()).toBe(0);
    expect(await page.locator('[data-testid=touch-student-name]').count()).toBe(0);
    // Once the server answers (its own session's user), the screen shows from its answers.
    await reads.release();
    await page.locator('[data-testid=touch-scale]').first().waitFor(patient);
    await context.close();
  });
});
