import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { chromium, type Browser } from 'playwright-core';
import { pattern } from '../../shared/music';
import { chromiumPath, saveScreenshot, signInAs } from '../support/browser';
import { synthTake, wavBytes } from '../support/synth-take';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;
let browser: Browser;
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-fake-microphone-'));
const wave = path.join(folder, 'take.wav');

// The take the fake microphone plays: concert Eb major arpeggio in whole notes for a flute at
// 160, its third (index 2, Bb4) played 40 cents flat; then silence so the file does not loop
// back in while recording.
const tempo = 160;
const notes = pattern('arpeggio-long', { tonic: 'Eb', mode: 'major' }, { instrument: 'flute' });
const synthesised = synthTake(notes, tempo, {
  sampleRate: 48_000,
  leadIn: 0.3,
  changes: [{ index: 2, cents: -40 }],
});
const padded = new Float32Array(synthesised.samples.length + 48_000 * 8);
padded.set(synthesised.samples);

beforeAll(async () => {
  fs.writeFileSync(wave, wavBytes(padded, 48_000));
  app = await startTestApp({ serveWeb: true });
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
      '--autoplay-policy=no-user-gesture-required',
    ],
  });
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
  fs.rmSync(folder, { recursive: true, force: true });
});

describe('The listening aid in the browser', () => {
  it('should record a take through the microphone, show what it heard and send it to the director', async () => {
    const context = await browser.newContext({ viewport: { width: 1360, height: 1000 } });
    await context.grantPermissions(['microphone'], { origin: app.url });
    const page = await context.newPage();
    const query = `tonic=Eb&mode=major&pattern=arpeggio-long&tempo=${tempo}&articulation=tongued&octaves=1&instrument=flute&requirementCode=r1-eb-major`;
    await signInAs(page, app.url, demoEmail('student.hpms'), `/practice?${query}`);
    await page.getByTestId('take-record').click();
    await page.getByTestId('take-stop').waitFor();
    await saveScreenshot(page, 'listening-recording');
    const summary = page.getByTestId('take-summary');
    await summary.waitFor({ timeout: 90_000 });
    await summary.scrollIntoViewIfNeeded();

    const labels = await page.getByTestId('take-note').allInnerTexts();
    expect(labels).toHaveLength(notes.length);
    expect(labels[2]).toMatch(/Out of tune, -\d+ ¢/);
    labels.filter((_, index) => index !== 2).forEach((label) => expect(label).toMatch(/In tune/));
    expect(await summary.innerText()).toMatch(new RegExp(`asked ${tempo}`));
    await saveScreenshot(page, 'listening-analysis');

    await page.getByTestId('take-send').click();
    await page.getByTestId('take-sent').waitFor();

    await saveScreenshot(page, 'listening-sent');
    const studentId = (
      (await (await page.request.get(`${app.url}/api/me`)).json()) as {
        studentId: number;
      }
    ).studentId;

    // The director of the student's school finds it, with the analysis the student saw.
    const directorApi = await app.signIn(demoEmail('director.hpms'));
    const takes = (await directorApi.get('/api/takes')).body as {
      status: string;
      requirementCode: string;
      analysis: { tempo: number; notes: { verdict: string }[] };
    }[];
    expect(takes).toHaveLength(1);
    expect(takes[0]).toMatchObject({ status: 'sent', requirementCode: 'r1-eb-major' });
    expect(takes[0]!.analysis.notes[2]!.verdict).toBe('out-of-tune');

    // The student's row in an ensemble's entry grid: active seats in the ensemble's order.
    const ensembles = (await directorApi.get('/api/ensembles?limit=100&sort=name:asc')).body
      .rows as { id: number }[];
    let place: { ensembleId: number; rowIndex: number } | undefined;
    for (const ensemble of ensembles) {
      const detail = (await directorApi.get(`/api/ensembles/${ensemble.id}`)).body as {
        members: { studentId: number; active: boolean }[];
      };
      const seen = new Set<number>();
      const rows = detail.members.filter(
        (member) => member.active && !seen.has(member.studentId) && seen.add(member.studentId),
      );
      const rowIndex = rows.findIndex((member) => member.studentId === studentId);
      if (rowIndex >= 0) {
        place = { ensembleId: ensemble.id, rowIndex };
        break;
      }
    }
    expect(place).toBeDefined();

    const directorContext = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const grid = await directorContext.newPage();
    await signInAs(
      grid,
      app.url,
      demoEmail('director.hpms'),
      `/pass-offs?ensemble=${place!.ensembleId}&rung=1`,
    );
    const cell = (rowIndex: number) =>
      grid.locator(`[role=row][row-index="${rowIndex}"] [role=gridcell][col-id="r1-eb-major"]`);
    await cell(0).waitFor({ timeout: 30_000 });
    await cell(0).click();
    await grid.mouse.move(1, 1);
    for (let step = 0; step < place!.rowIndex; step++) await grid.keyboard.press('ArrowDown');
    await expect
      .poll(() => cell(place!.rowIndex).innerText(), { timeout: 20_000 })
      .toMatch(/take sent/);
    const heard = grid.getByTestId('cell-take');
    await heard.waitFor();
    expect(await heard.innerText()).toMatch(/6 of 7 notes in tune/);
    expect(await grid.getByTestId('take-suggestion').innerText()).toMatch(/not yet — you decide/);
    await grid.getByTestId('take-prefill').click();
    const tempoHeard = Math.round(takes[0]!.analysis.tempo);
    await expect
      .poll(() => cell(place!.rowIndex).innerText(), { timeout: 20_000 })
      .toMatch(new RegExp(`♩${tempoHeard}`));
    // Passed or not is the director's key to press: the cell waits for P or N.
    expect(await cell(place!.rowIndex).innerText()).toMatch(/P passed · N not yet/);
    await saveScreenshot(grid, 'listening-director-cell');
    await directorContext.close();
    await context.close();
  });
});
