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

    // The director of the student's school now finds it, with the analysis the student saw.
    const director = await context.browser()!.newContext();
    const directorPage = await director.newPage();
    await signInAs(directorPage, app.url, demoEmail('director.hpms'));
    const takes = (await (await directorPage.request.get(`${app.url}/api/takes`)).json()) as {
      status: string;
      requirementCode: string;
      analysis: { notes: { verdict: string }[] };
    }[];
    expect(takes).toHaveLength(1);
    expect(takes[0]).toMatchObject({ status: 'sent', requirementCode: 'r1-eb-major' });
    expect(takes[0]!.analysis.notes[2]!.verdict).toBe('out-of-tune');
    await director.close();
    await context.close();
  });
});
