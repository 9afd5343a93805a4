import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { chromium, type Browser } from 'playwright-core';
import { sql } from 'drizzle-orm';
import { findInstrument, pattern, type PatternNote } from '@shared/music';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import { rowsOf } from '../../server/db/client';
import { chromiumPath, saveScreenshot, signInAs } from '../support/browser';
import { synthTake, wavBytes } from '../support/synth-take';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;
let browser: Browser;
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-fake-microphone-'));
const wave = path.join(folder, 'take.wav');
const slowWave = path.join(folder, 'slow-take.wav');

/** The take's requirement, the student's place in an ensemble's grid, and the notes played. */
interface TakePlan {
  ensembleId: number;
  rowIndex: number;
  rung: number;
  requirement: LadderRequirement;
  instrumentId: string;
  notes: PatternNote[];
}
let plan: TakePlan;

/**
 * The demo student's first requirement on the active ladder that their instrument is asked, and
 * their row in one of their ensembles' entry grid (active seats in the ensemble's order, one per
 * student).
 */
async function planTake(): Promise<TakePlan> {
  const directorApi = await app.signIn(demoEmail('director.hpms'));
  const ladder = (await directorApi.get('/api/ladder')).body as Ladder;
  const [account] = rowsOf<{ student_id: number }>(
    await app.database.db.execute(
      sql`select student_id from users where email = ${demoEmail('student.hpms')}`,
    ),
  );
  const ensembles = (await directorApi.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as {
    id: number;
  }[];
  for (const ensemble of ensembles) {
    const detail = (await directorApi.get(`/api/ensembles/${ensemble.id}`)).body as {
      members: { studentId: number; active: boolean; instrumentId: string | null }[];
    };
    const seen = new Set<number>();
    const rows = detail.members.filter(
      (member) => member.active && !seen.has(member.studentId) && seen.add(member.studentId),
    );
    const rowIndex = rows.findIndex((member) => member.studentId === account!.student_id);
    const instrumentId = rows[rowIndex]?.instrumentId;
    if (rowIndex < 0 || !instrumentId) continue;
    const family = findInstrument(instrumentId)!.family as string;
    for (const rung of ladder.rungs) {
      const requirement = rung.requirements.find(
        (each) => !each.families || (each.families as string[]).includes(family),
      );
      if (!requirement) continue;
      const notes = pattern(
        requirement.pattern,
        { tonic: requirement.tonic, mode: requirement.mode },
        {
          instrument: instrumentId,
          octaves: requirement.octaves,
          articulation: requirement.articulation,
        },
      );
      return {
        ensembleId: ensemble.id,
        rowIndex,
        rung: rung.number,
        requirement,
        instrumentId,
        notes,
      };
    }
  }
  throw new Error('The demo student plays in no ensemble with a requirement for their instrument.');
}

beforeAll(async () => {
  app = await startTestApp({ serveWeb: true });
  plan = await planTake();
  // What the fake microphone plays: the requirement at its tempo, its third note 40 cents flat,
  // then silence, so that the file does not loop back in while recording.
  const synthesised = synthTake(plan.notes, plan.requirement.tempo, {
    sampleRate: 48_000,
    leadIn: 0.3,
    changes: [{ index: 2, cents: -40 }],
  });
  const padded = new Float32Array(synthesised.samples.length + 48_000 * 8);
  padded.set(synthesised.samples);
  fs.writeFileSync(wave, wavBytes(padded, 48_000));
  // What the director records live: the same requirement, every note in tune, 8 % slow.
  const slow = synthTake(plan.notes, plan.requirement.tempo, {
    sampleRate: 44_100,
    tempoShare: 0.92,
  });
  fs.writeFileSync(slowWave, wavBytes(slow.samples, 44_100));
  browser = await chromium.launch({
    executablePath: chromiumPath,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--no-first-run',
      '--disable-background-networking',
      '--use-fake-ui-for-media-stream',
      '--use-fake-device-for-media-stream',
      `--use-file-for-fake-audio-capture=${wave}`,
    ],
  });
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
  fs.rmSync(folder, { recursive: true, force: true });
});

describe('The listening aid in the browser', () => {
  it('should record a take through the microphone, send it, and let the director fill the cell from it', async () => {
    const { requirement, notes } = plan;
    const context = await browser.newContext({ viewport: { width: 1360, height: 1000 } });
    await context.grantPermissions(['microphone'], { origin: app.url });
    const page = await context.newPage();
    const query = new URLSearchParams({
      tonic: requirement.tonic,
      mode: requirement.mode,
      pattern: requirement.pattern,
      tempo: String(requirement.tempo),
      articulation: requirement.articulation,
      octaves: String(requirement.octaves),
      instrument: plan.instrumentId,
      requirementCode: requirement.code,
    });
    await signInAs(page, app.url, demoEmail('student.hpms'), `/practice?${query}`);
    await page.getByTestId('take-record').click();
    await page.getByTestId('take-stop').waitFor();
    await saveScreenshot(page, 'listening-recording');
    const summary = page.getByTestId('take-summary');
    await summary.waitFor({ timeout: 150_000 });
    await summary.scrollIntoViewIfNeeded();

    // Every note is labelled in words; only the planted flat note is flagged.
    const labels = await page.getByTestId('take-note').allInnerTexts();
    expect(labels).toHaveLength(notes.length);
    expect(labels[2]).toMatch(/Out of tune, -\d+ ¢/);
    labels.filter((_, index) => index !== 2).forEach((label) => expect(label).toMatch(/In tune/));
    expect(await summary.innerText()).toMatch(new RegExp(`asked ${requirement.tempo}`));
    await saveScreenshot(page, 'listening-analysis');
    await page.getByTestId('take-send').click();
    await page.getByTestId('take-sent').waitFor();
    await saveScreenshot(page, 'listening-sent');
    await context.close();

    // The director of the student's school: the cell is marked, its panel plays the take with
    // what was heard, and fills the tempo heard; passed or not is the director's key to press.
    const directorApi = await app.signIn(demoEmail('director.hpms'));
    const takes = (await directorApi.get('/api/takes')).body as {
      requirementCode: string;
      analysis: { tempo: number; notes: { verdict: string }[] };
    }[];
    expect(takes).toHaveLength(1);
    expect(takes[0]!.requirementCode).toBe(requirement.code);
    expect(takes[0]!.analysis.notes[2]!.verdict).toBe('out-of-tune');

    const directorContext = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const grid = await directorContext.newPage();
    await signInAs(
      grid,
      app.url,
      demoEmail('director.hpms'),
      `/pass-offs?ensemble=${plan.ensembleId}&rung=${plan.rung}`,
    );
    const cell = (rowIndex: number) =>
      grid.locator(
        `[role=row][row-index="${rowIndex}"] [role=gridcell][col-id="${requirement.code}"]`,
      );
    await grid.locator('[role=row][row-index="0"]').first().waitFor({ timeout: 60_000 });
    await cell(0).click();
    await grid.mouse.move(1, 1);
    for (let step = 0; step < plan.rowIndex; step++) await grid.keyboard.press('ArrowDown');
    await expect.poll(() => cell(plan.rowIndex).innerText(), { timeout: 20_000 }).toMatch(/♪ take/);
    const heard = grid.getByTestId('cell-take');
    await heard.waitFor();
    expect(await heard.innerText()).toMatch(
      new RegExp(`${notes.length - 1} of ${notes.length} notes in tune`),
    );
    expect(await grid.getByTestId('take-suggestion').innerText()).toMatch(/not yet — you decide/);
    await grid.getByTestId('take-prefill').click();
    const tempoHeard = Math.round(takes[0]!.analysis.tempo);
    await expect
      .poll(() => cell(plan.rowIndex).innerText(), { timeout: 20_000 })
      .toMatch(new RegExp(`♩${tempoHeard}`));
    expect(await cell(plan.rowIndex).innerText()).toMatch(/P passed · N not yet/);
    await saveScreenshot(grid, 'listening-director-cell');

    // The director listens to the student live: a file that is not sound gets a clear message.
    const upload = grid.getByTestId('director-take-file');
    await upload.setInputFiles({
      name: 'notes.txt',
      mimeType: 'text/plain',
      buffer: Buffer.from('Not a recording.'),
    });
    await expect
      .poll(() => grid.getByTestId('director-take-problem').innerText(), { timeout: 20_000 })
      .toMatch(/not a sound file this browser can read/);

    // A recording of the student playing 8 % slow with every note in tune: the same analysis
    // against the requirement's notes at its tempo, and the slower tempo heard fills the cell.
    await upload.setInputFiles(slowWave);
    const directorTake = grid.getByTestId('director-take');
    await directorTake.getByTestId('take-summary').waitFor({ timeout: 60_000 });
    const directorLabels = await directorTake.getByTestId('take-note').allInnerTexts();
    expect(directorLabels).toHaveLength(notes.length);
    directorLabels.forEach((label) => expect(label).toMatch(/In tune/));
    expect(await directorTake.getByTestId('take-summary').innerText()).toMatch(
      new RegExp(`asked ${requirement.tempo}`),
    );
    // 8 % slow is below the tempo asked: the aid suggests not yet; the director decides.
    expect(await grid.getByTestId('director-take-suggestion').innerText()).toMatch(
      /not yet — you decide/,
    );
    const prefill = grid.getByTestId('director-take-prefill');
    const slowHeard = Number(/♩(\d+)/.exec(await prefill.innerText())![1]);
    // The planted tempo (synthesised 8 % slow), within 3 % of the tempo asked: a looser band
    // than the engine's own tests, as the browser's decoder resamples the file to its own rate.
    expect(Math.abs(slowHeard - requirement.tempo * 0.92)).toBeLessThanOrEqual(
      requirement.tempo * 0.03,
    );
    expect(slowHeard).not.toBe(tempoHeard);
    await prefill.click();
    await expect
      .poll(() => cell(plan.rowIndex).innerText(), { timeout: 20_000 })
      .toMatch(new RegExp(`♩${slowHeard}`));
    expect(await cell(plan.rowIndex).innerText()).toMatch(/P passed · N not yet/);
    // The director keeps the take as evidence: one more of the student's takes, sent, recorded
    // by the director.
    await directorTake.getByTestId('director-take-keep').click();
    await directorTake.getByTestId('director-take-kept').waitFor({ timeout: 20_000 });
    const kept = rowsOf<{ status: string; recorded_by: number | null }>(
      await app.database.db.execute(
        `select status, recorded_by from takes where recorded_by is not null` as never,
      ),
    );
    expect(kept).toHaveLength(1);
    expect(kept[0]!.status).toBe('sent');
    await directorTake.scrollIntoViewIfNeeded();
    await saveScreenshot(grid, 'listening-director-take');
    await directorContext.close();
  });
});
