import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoEmail, type SignedInClient } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import {
  chooseOption,
  localOnlyContext,
  embeddedBlock,
  saveScreenshot,
  serveIndexAsWorkerKeepsIt,
  signInAs,
} from '../support/browser';
import type { EnsembleDetail } from '@shared/api/ensemble';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import type { StudentProgress } from '@shared/api/analytics';
import { findInstrument } from '@shared/music/index';

const e2e = useBrowserApp();
let director: SignedInClient;
let ladder: Ladder;

/** A student of an ensemble who has no rung yet and stands before rung 1. */
interface Candidate {
  ensembleId: number;
  ensembleName: string;
  studentId: number;
  name: string;
  /** The student's row in the grid: active seats in the ensemble's own order, one per student. */
  rowIndex: number;
  /** The rung-1 columns the grid shows for this ensemble, and which of them the student plays. */
  columns: LadderRequirement[];
  asked: LadderRequirement[];
}

const patient = { timeout: 20_000 };

/** The pass-off screen's first reads of an ensemble, as the browser asks for them. */
const entryReadsOf = (ensembleId: number) => [
  '/api/ensembles?sort=name:asc&limit=500',
  '/api/ladder',
  `/api/ensembles/${ensembleId}`,
  `/api/pass-offs?ensembleId=${ensembleId}&limit=1000&offset=0`,
  `/api/analytics/students?ensembleId=${ensembleId}&limit=1000`,
];

/** The API reads the page asks the server for from now on, in order (decoded). */
function apiReadsOf(page: Page): string[] {
  const reads: string[] = [];
  page.on('request', (request) => {
    const url = new URL(request.url());
    if (request.method() === 'GET' && url.pathname.startsWith('/api/'))
      reads.push(decodeURIComponent(url.pathname + url.search));
  });
  return reads;
}

function appliesTo(requirement: LadderRequirement, family: string | null): boolean {
  return (
    !requirement.families ||
    (family !== null && (requirement.families as string[]).includes(family))
  );
}

/** Students of Heron Point ensembles on rung 0 whose next rung is 1, found through the API. */
async function rungZeroStudents(count: number): Promise<Candidate[]> {
  const found: Candidate[] = [];
  const ensembles = (await director.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as {
    id: number;
    name: string;
  }[];
  for (const ensemble of ensembles) {
    const detail = (await director.get(`/api/ensembles/${ensemble.id}`)).body as EnsembleDetail;
    const seen = new Set<number>();
    const rows = detail.members.filter(
      (member) => member.active && !seen.has(member.studentId) && seen.add(member.studentId),
    );
    const families = rows.map((member) =>
      member.instrumentId ? (findInstrument(member.instrumentId)?.family ?? null) : null,
    );
    const columns = ladder.rungs[0]!.requirements.filter((requirement) =>
      families.some((family) => appliesTo(requirement, family)),
    );
    const onRungZero = (
      await director.get(`/api/analytics/students?ensembleId=${ensemble.id}&rung=0&limit=1000`)
    ).body.rows as { id: number }[];
    for (const { id } of onRungZero) {
      const rowIndex = rows.findIndex((member) => member.studentId === id);
      if (rowIndex < 0 || families[rowIndex] === null) continue;
      const progress = (await director.get(`/api/analytics/students/${id}/progress`))
        .body as StudentProgress;
      if (progress.rung !== 0 || progress.next.rung !== 1) continue;
      const member = rows[rowIndex]!;
      const asked = columns.filter((requirement) => appliesTo(requirement, families[rowIndex]!));
      found.push({
        ensembleId: ensemble.id,
        ensembleName: ensemble.name,
        studentId: id,
        name: `${member.preferredName ?? member.firstName} ${member.lastName}`,
        rowIndex,
        columns,
        asked,
      });
      if (found.length === count) return found;
    }
  }
  throw new Error(`Only ${found.length} Heron Point students stand before rung 1.`);
}

function cell(page: Page, rowIndex: number, colId: string) {
  return page.locator(`[role=row][row-index="${rowIndex}"] [role=gridcell][col-id="${colId}"]`);
}

/** Opens Pass-offs and picks the ensemble and rung 1 with the selects. */
async function openSheet(page: Page, candidate: Candidate) {
  await page.goto(`${e2e.app.url}/pass-offs`);
  await chooseOption(page, 'choose-ensemble', new RegExp(`^${candidate.ensembleName} ·`));
  await chooseOption(page, 'choose-rung', /^Rung 1 —/);
  await expect
    .poll(() => page.locator('[role=row][row-index="0"]').count(), patient)
    .toBeGreaterThan(0);
}

/** Puts the keyboard on the student's first rung-1 column: one click into the grid, then arrows. */
async function focusRow(page: Page, candidate: Candidate) {
  await cell(page, 0, candidate.columns[0]!.code).click();
  // Off the grid, so no header tooltip stays open over the rows.
  await page.mouse.move(1, 1);
  for (let step = 0; step < candidate.rowIndex; step++) await page.keyboard.press('ArrowDown');
  await expect
    .poll(() => cell(page, candidate.rowIndex, candidate.columns[0]!.code).count(), patient)
    .toBe(1);
}

async function passOffsWithKeys(studentId: number): Promise<PassOff[]> {
  const list = (await director.get(`/api/pass-offs?studentId=${studentId}&limit=1000`)).body
    .rows as PassOff[];
  return list.filter((passOff) => passOff.clientKey !== null);
}

beforeAll(async () => {
  director = await e2e.app.signIn(demoEmail('director.hpms'));
  ladder = (await director.get('/api/ladder')).body as Ladder;
});

describe('Pass-offs entry', () => {
  it('should record a row of pass-offs from the keyboard, keep them after a reload, and move the student up a rung', async () => {
    const [candidate] = await rungZeroStudents(1);
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    const gridWarnings: string[] = [];
    page.on('console', (message) => {
      if (/AG Grid/i.test(message.text())) gridWarnings.push(message.text());
    });
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    await page.locator('nav[aria-label="Main"] a.item', { hasText: 'Pass-offs' }).click();
    await page.waitForURL(`${e2e.app.url}/pass-offs`);
    await expect
      .poll(
        () => page.getByRole('heading', { name: /Choose an ensemble and a rung/ }).count(),
        patient,
      )
      .toBe(1);
    await openSheet(page, candidate!);
    await focusRow(page, candidate!);

    // P on every scale asked of the student; the second one heard at ♩ = 64, typed.
    const typedTempo = 64;
    for (const [position, requirement] of candidate!.columns.entries()) {
      if (candidate!.asked.includes(requirement)) {
        if (requirement === candidate!.asked[1]) await page.keyboard.type(String(typedTempo));
        await page.keyboard.press('p');
      }
      if (position < candidate!.columns.length - 1) await page.keyboard.press('ArrowRight');
    }
    for (const requirement of candidate!.asked) {
      await expect
        .poll(() => cell(page, candidate!.rowIndex, requirement.code).innerText(), patient)
        .toContain('saved ✓');
    }
    expect(await cell(page, candidate!.rowIndex, candidate!.asked[1]!.code).innerText()).toContain(
      `♩${typedTempo}`,
    );
    const progress = (
      await director.get(`/api/analytics/students/${candidate!.studentId}/progress`)
    ).body as StudentProgress;
    expect(progress.rung).toBeGreaterThanOrEqual(1);
    // The rung column follows the saves.
    await expect
      .poll(() => cell(page, candidate!.rowIndex, 'rung').innerText(), patient)
      .toBe(String(progress.rung));
    await saveScreenshot(page, 'pass-offs-grid');

    const recorded = await passOffsWithKeys(candidate!.studentId);
    expect(recorded.map((passOff) => passOff.requirementCode).sort()).toEqual(
      candidate!.asked.map((requirement) => requirement.code).sort(),
    );
    expect(
      recorded.every((passOff) => passOff.passed && passOff.heardByName === 'Marcus Feldqvist'),
    ).toBe(true);
    expect(
      recorded.find((passOff) => passOff.requirementCode === candidate!.asked[1]!.code)!.tempo,
    ).toBe(typedTempo);

    await page.reload();
    await expect
      .poll(() => page.locator('[role=row][row-index="0"]').count(), patient)
      .toBeGreaterThan(0);
    await focusRow(page, candidate!);
    for (const requirement of candidate!.asked) {
      const tempo = requirement === candidate!.asked[1] ? typedTempo : requirement.tempo;
      await expect
        .poll(() => cell(page, candidate!.rowIndex, requirement.code).innerText(), patient)
        .toContain(`✓ Passed ♩${tempo}`);
    }

    await page.goto(`${e2e.app.url}/students/${candidate!.studentId}`);
    await expect
      .poll(() => page.getByTestId('progress-rung').innerText(), patient)
      .toMatch(new RegExp(`^Rung ${progress.rung} of 7`));
    expect(await page.getByTestId('progress-student').innerText()).toBe(candidate!.name);
    expect(await page.getByTestId('student-record').getAttribute('href')).toBe(
      `/students/${candidate!.studentId}/edit`,
    );
    expect(outside).toEqual([]);
    // AG Grid names a missing module or a wrong option on the console.
    expect(gridWarnings).toEqual([]);
    await context.close();
  });

  it('should keep entries made offline, say they are waiting, and save each exactly once when back online', async () => {
    const [, candidate] = await rungZeroStudents(2);
    expect(candidate!.asked.length).toBeGreaterThanOrEqual(2);
    const before = await passOffsWithKeys(candidate!.studentId);
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    await openSheet(page, candidate!);
    await focusRow(page, candidate!);

    await context.setOffline(true);
    const [first, second] = candidate!.asked;
    for (const [position, requirement] of candidate!.columns.entries()) {
      if (requirement === first) await page.keyboard.press('p');
      if (requirement === second) await page.keyboard.press('n');
      if (position < candidate!.columns.length - 1) await page.keyboard.press('ArrowRight');
      if (requirement === second) break;
    }
    await expect
      .poll(() => page.getByTestId('queue-banner').innerText(), patient)
      .toContain('2 entries waiting to be saved — they will be sent when the connection returns');
    const stored = await page.evaluate(() =>
      Object.keys(localStorage)
        .filter((key) => key.startsWith('tuttiboard.pass-off-queue.'))
        .flatMap(
          (key) => JSON.parse(localStorage.getItem(key) ?? '[]') as { requirementCode: string }[],
        )
        .map((entry) => entry.requirementCode),
    );
    expect(stored.sort()).toEqual([first!.code, second!.code].sort());
    expect(await cell(page, candidate!.rowIndex, first!.code).innerText()).toContain(
      'waiting to send',
    );
    await saveScreenshot(page, 'pass-offs-offline');

    await context.setOffline(false);
    await expect
      .poll(() => cell(page, candidate!.rowIndex, first!.code).innerText(), patient)
      .toContain('saved ✓');
    await expect
      .poll(() => cell(page, candidate!.rowIndex, second!.code).innerText(), patient)
      .toContain('✕ Not yet');
    await expect.poll(() => page.getByTestId('queue-banner').count(), patient).toBe(0);

    const after = await passOffsWithKeys(candidate!.studentId);
    const created = after.filter((passOff) => !before.some((earlier) => earlier.id === passOff.id));
    expect(created).toHaveLength(2);
    expect(new Set(created.map((passOff) => passOff.clientKey)).size).toBe(2);
    expect(created.map((passOff) => `${passOff.requirementCode}:${passOff.passed}`).sort()).toEqual(
      [`${first!.code}:true`, `${second!.code}:false`].sort(),
    );
    const left = await page.evaluate(
      () =>
        Object.keys(localStorage).filter((key) => key.startsWith('tuttiboard.pass-off-queue.'))
          .length,
    );
    expect(left).toBe(0);
    await context.close();
  });

  it("should open a student's history with their pass-offs from the student column", async () => {
    const [candidate] = await rungZeroStudents(1);
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    await openSheet(page, candidate!);
    await focusRow(page, candidate!);
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('Enter');
    const history = page.getByTestId('student-history');
    await expect.poll(() => history.isVisible(), patient).toBe(true);
    const all = (await director.get(`/api/pass-offs?studentId=${candidate!.studentId}&limit=1000`))
      .body;
    await expect.poll(() => history.getByTestId('history-item').count(), patient).toBe(all.total);
    expect(await history.innerText()).toContain('10 MB');
    await context.close();
  });

  it('should name its code ahead in the index page and ask for each of its reads once', async () => {
    const [ensemble] = (await director.get('/api/ensembles?limit=1&sort=name:asc')).body.rows as {
      id: number;
    }[];
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    // The links in the page as opened (the index page's own script adds the screen's, under the
    // server's Content-Security-Policy; HTML Living Standard, "Link type modulepreload").
    const preloads = async (address: string) => {
      await page.goto(`${e2e.app.url}${address}`, { waitUntil: 'domcontentloaded' });
      return page.evaluate(() =>
        Array.from(document.querySelectorAll('link[rel=modulepreload]'), (link) =>
          link.getAttribute('href'),
        ),
      );
    };
    const named = await preloads(`/pass-offs?ensemble=${ensemble!.id}&rung=1`);
    // The screen's code is named beside the first bundle's; another screen's page names less.
    expect(named.length).toBeGreaterThan((await preloads('/overview')).length + 10);
    for (const file of named) expect((await fetch(`${e2e.app.url}/${file}`)).status).toBe(200);
    // The index page the service worker keeps is the same page, and its manifest names its hash.
    const kept = await (await fetch(`${e2e.app.url}/index.html`)).text();
    expect(await (await fetch(`${e2e.app.url}/pass-offs`)).text()).toBe(kept);
    const hashTable = (
      (await (await fetch(`${e2e.app.url}/ngsw.json`)).json()) as {
        hashTable: Record<string, string>;
      }
    ).hashTable;
    // Angular's service worker guide: hashTable holds each file's SHA-1, in hex.
    expect(hashTable['/index.html']).toBe(createHash('sha1').update(kept).digest('hex'));

    // Away from the start page first, so none of its reads is counted.
    await page.goto('about:blank');
    // The page as the service worker's copy of the index page is, without the answers a
    // signed-in navigation is served with: the reads then start as the route matches.
    await serveIndexAsWorkerKeepsIt(page);
    const reads = apiReadsOf(page);
    await page.goto(`${e2e.app.url}/pass-offs?ensemble=${ensemble!.id}&rung=1`);
    await expect
      .poll(() => page.locator('[role=row][row-index="0"]').count(), patient)
      .toBeGreaterThan(0);
    await page.waitForLoadState('networkidle');
    // The reads started as the route matched are the ones the screen takes: none asked twice.
    const screenReads = entryReadsOf(ensemble!.id);
    for (const read of screenReads) expect(reads.filter((each) => each === read)).toEqual([read]);
    // And they left before the screen existed: before the reads its own parts make as they start.
    const firstOwn = Math.min(reads.indexOf('/api/takes'), reads.indexOf('/api/school-years'));
    expect(firstOwn).toBeGreaterThan(0);
    for (const read of screenReads) expect(reads.indexOf(read)).toBeLessThan(firstOwn);
    await context.close();
  });

  it('should be served with its first reads when signed in, and ask the server for none of them', async () => {
    const [ensemble] = (await director.get('/api/ensembles?limit=1&sort=name:asc')).body.rows as {
      id: number;
    }[];
    const address = `${e2e.app.url}/pass-offs?ensemble=${ensemble!.id}&rung=1`;
    // Signed out: the plain page, which a browser may keep and revalidate.
    const signedOut = await fetch(address);
    expect(await signedOut.text()).not.toMatch(embeddedBlock);
    expect(signedOut.headers.get('cache-control')).toBe('no-cache');

    // No service worker: it would answer the navigation with its own copy of the plain page.
    const { context } = await localOnlyContext(e2e.browser, { serviceWorkers: 'block' });
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    await page.goto('about:blank');
    const reads = apiReadsOf(page);
    const served = await page.goto(address);
    // Signed in: the user's own data, kept by no cache (RFC 9111 §5.2.2.5).
    expect(served!.headers()['cache-control']).toBe('no-store');
    expect(await served!.text()).toMatch(embeddedBlock);
    await expect
      .poll(() => page.locator('[role=row][row-index="0"]').count(), patient)
      .toBeGreaterThan(0);
    await page.waitForLoadState('networkidle');
    for (const read of [
      '/api/me',
      '/api/district',
      '/api/school-years',
      ...entryReadsOf(ensemble!.id),
    ])
      expect(reads).not.toContain(read);
    // The pages after the first came with it too.
    expect(reads.filter((read) => read.startsWith('/api/pass-offs'))).toEqual([]);
    // The data block is read once and taken out of the page.
    expect(await page.locator('#tb-embedded-reads').count()).toBe(0);
    await context.close();
  });
});
