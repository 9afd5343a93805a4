import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, screenshotFolder, signInAs } from '../support/browser';

const e2e = useBrowserApp();

const requirement =
  'tonic=Bb&mode=major&pattern=cycle-broad&tempo=100&articulation=tongue-up-slur-down&octaves=1';

/*
 * Concert Bb major for each section. Written keys: Samuel Adler, The Study of Orchestration
 * (3rd ed., 2002) for the transpositions (Bb clarinet a major 2nd below written, Eb alto
 * saxophone a major 6th, horn in F a perfect 5th; trombone, tuba and violin as written), and
 * Kostka & Payne, Tonal Harmony, for the signatures (C major none, G major one sharp, F major
 * one flat, Bb major two flats).
 */
const sections = [
  { instrument: 'clarinet', written: 'written C major for B♭ clarinet, treble clef', fifths: 0 },
  {
    instrument: 'alto-sax',
    written: 'written G major for E♭ alto saxophone, treble clef',
    fifths: 1,
  },
  { instrument: 'horn', written: 'written F major for horn in F, treble clef', fifths: -1 },
  { instrument: 'trombone', written: 'written B♭ major for trombone, bass clef', fifths: -2 },
  { instrument: 'tuba', written: 'written B♭ major for tuba, bass clef', fifths: -2 },
  { instrument: 'viola', written: 'written B♭ major for viola, alto clef', fifths: -2 },
  { instrument: 'marimba', written: 'written B♭ major for marimba, treble clef', fifths: -2 },
];

/**
 * The broad cycle over one octave as one line (common practice, no source): the scale up (8
 * notes) and down (7), then the arpeggio from that same tonic up (3 more) and down (3), the
 * turning notes as half notes, the rest as quarters and the last tonic a whole note.
 */
const broadCycleNotes = 8 + 7 + 3 + 3;

/** Waits until the staff inside `scope` has been drawn and returns its number of notes. */
async function drawnNotes(page: Page, scope: string): Promise<number> {
  const canvas = page.locator(`${scope} [role=img][data-notes]`);
  await canvas.first().waitFor();
  return Number(await canvas.first().getAttribute('data-notes'));
}

/**
 * Where each slur of the sheet starts against the key signature at the head of its line: a slur
 * continued from the line above starts after the clef and key signature, never on top of them
 * (common engraving practice, no source). Answers the slurs that start on top of one and how
 * many start just after one (continued onto a new line).
 */
async function slursAgainstKeySignatures(page: Page) {
  return page.evaluate(() => {
    const boxes = (selector: string) =>
      Array.from(document.querySelectorAll(`[data-testid=sheet-staff] svg ${selector}`)).map(
        (element) => (element as SVGGraphicsElement).getBoundingClientRect(),
      );
    const keys = boxes('.vf-keysignature');
    const onTop: string[] = [];
    let openingALine = 0;
    for (const slur of boxes('.vf-slur')) {
      const middle = (slur.top + slur.bottom) / 2;
      for (const key of keys) {
        const sameLine = Math.abs((key.top + key.bottom) / 2 - middle) < 60;
        if (!sameLine || key.left > slur.right) continue;
        if (slur.left < key.right - 1)
          onTop.push(`${slur.left.toFixed(0)} < ${key.right.toFixed(0)}`);
        else if (slur.left - key.right < 40) openingALine += 1;
      }
    }
    return { onTop, openingALine };
  });
}

describe('Practice sheets', () => {
  it('should write concert Bb major in each section’s own key, clef and notes', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    let continuedSlurs = 0;
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/practice');
    await page.waitForURL(/\/practice/);
    await expect
      .poll(() => page.locator('nav[aria-label="Main"] a.item').allInnerTexts())
      .toContain('Practice sheets');

    for (const section of sections) {
      await page.goto(`${e2e.app.url}/practice?${requirement}&instrument=${section.instrument}`);
      const caption = page.getByTestId('sheet-caption');
      await expect.poll(() => caption.innerText()).toBe(`Concert B♭ major → ${section.written}`);
      // 28 beats at quarter = 100 last 16.8 seconds.
      expect(await page.getByTestId('sheet-duration').innerText()).toBe('about 17 s at ♩ = 100');
      expect(await drawnNotes(page, '[data-testid=sheet-staff]')).toBe(broadCycleNotes);
      const staff = page.locator('[data-testid=sheet-staff] svg');
      expect(await staff.locator('.vf-stavenote').count()).toBe(broadCycleNotes);
      // Tongue up, slur down: the falling scale and the falling arpeggio each carry a slur.
      expect(await staff.locator('.vf-slur').count()).toBeGreaterThanOrEqual(2);
      expect(await staff.locator('.vf-keysignature').count()).toBeGreaterThan(0);
      await page.evaluate(() => document.fonts.ready);
      await saveScreenshot(page, `practice-${section.instrument}`);
      expect(await page.getByTestId('sheet-levels').innerText()).toContain('High school');

      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByTestId('download').click(),
      ]);
      expect(download.suggestedFilename()).toBe(
        `bb-major-cycle-broad-${section.instrument}.musicxml`,
      );
      const xml = fs.readFileSync((await download.path()) as string, 'utf8');
      const parsed = await page.evaluate((text) => {
        const document = new DOMParser().parseFromString(text, 'application/xml');
        return {
          error: document.querySelector('parsererror')?.textContent ?? null,
          fifths: document.querySelector('key > fifths')?.textContent,
          notes: document.querySelectorAll('note > pitch').length,
        };
      }, xml);
      expect(parsed.error).toBeNull();
      expect(Number(parsed.fifths)).toBe(section.fifths);
      expect(parsed.notes).toBe(broadCycleNotes);

      // The brisk cycle: the same notes in quarters and eighths, 16 beats (9.6 s at 100).
      const brisk = requirement.replace('cycle-broad', 'cycle-brisk');
      await page.goto(`${e2e.app.url}/practice?${brisk}&instrument=${section.instrument}`);
      await expect
        .poll(() => page.getByTestId('sheet-duration').innerText())
        .toBe('about 10 s at ♩ = 100');
      expect(await drawnNotes(page, '[data-testid=sheet-staff]')).toBe(broadCycleNotes);
      await page.evaluate(() => document.fonts.ready);
      await saveScreenshot(page, `practice-${section.instrument}-brisk`);
      const slurStarts = await slursAgainstKeySignatures(page);
      expect(slurStarts.onTop).toEqual([]);
      continuedSlurs += slurStarts.openingALine;
    }
    // The band's cycles run onto a second line in the brisk layout, so some slur opens a line.
    expect(continuedSlurs).toBeGreaterThan(0);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should print a band set with one staff for every wind, brass and mallet part', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), `/practice?${requirement}`);
    await page.getByTestId('open-band-set').click();
    await page.waitForURL(/view=band-set/);
    const parts = page.locator('[data-testid=band-set] article.part');
    // A concert band's 10 woodwind, 6 brass and 3 mallet parts in the engine's instrument list.
    await expect.poll(() => parts.count()).toBe(19);
    await expect
      .poll(() => page.locator('[data-testid=band-set] [role=img][data-notes]').count())
      .toBe(19);
    // Adler: the Bb clarinet reads a major 2nd above concert, the Eb alto saxophone a major 6th.
    expect(await parts.filter({ hasText: 'B♭ clarinet' }).first().innerText()).toContain(
      'written C major',
    );
    expect(await parts.filter({ hasText: 'E♭ alto saxophone' }).innerText()).toContain(
      'written G major',
    );
    await page.emulateMedia({ media: 'print' });
    expect(await page.locator('nav[aria-label="Main"]').isVisible()).toBe(false);
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({
      path: path.join(screenshotFolder, 'practice-band-set.png'),
      fullPage: true,
    });
    await page.emulateMedia({ media: 'screen' });

    await page.getByRole('radio', { name: 'String orchestra' }).click();
    await expect.poll(() => parts.count()).toBe(4);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should list the practice plan and load a step into the sheet', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(
      page,
      e2e.app.url,
      demoEmail('student.hpms'),
      `/practice?${requirement}&instrument=clarinet`,
    );
    const steps = page.locator('[data-testid=plan-panel] li.step');
    await expect.poll(() => steps.count()).toBeGreaterThan(3);
    const stepCount = await steps.count();
    await page.locator('li.step[data-step=long-tones] button').click();
    await expect.poll(() => page.getByTestId('step-banner').innerText()).toContain('Long tones');
    // Long tones over one octave: the scale up (8 whole notes) and down (7).
    expect(await drawnNotes(page, '[data-testid=sheet-staff]')).toBe(15);
    // A whole note at quarter = 60 lasts 4 s (common practice, no source): 15 of them, 60 s.
    expect(await page.getByTestId('sheet-duration').innerText()).toBe('about 1 min at ♩ = 60');

    await page.getByRole('button', { name: 'Print plan' }).click();
    await page.waitForURL(/view=plan/);
    const rows = page.locator('[data-testid=plan-print] li.row');
    await expect.poll(() => rows.count()).toBe(stepCount);
    await expect
      .poll(() => page.locator('[data-testid=plan-print] [role=img][data-notes]').count())
      .toBe(stepCount);
    await page.evaluate(() => document.fonts.ready);
    const pdf = await page.pdf({ format: 'Letter', preferCSSPageSize: true });
    // ISO 32000-1 (PDF 1.7) §7.7.3.3: every page of the document is a /Type /Page object.
    const pages = pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? [];
    expect(pages.length).toBe(1);
    await page.emulateMedia({ media: 'print' });
    await page.screenshot({
      path: path.join(screenshotFolder, 'practice-plan-print.png'),
      fullPage: true,
    });
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should play at concert pitch on a press of Play and stop again', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(
      page,
      e2e.app.url,
      demoEmail('director.hpms'),
      `/practice?${requirement}&instrument=horn`,
    );
    const play = page.getByTestId('play');
    await expect.poll(() => play.innerText()).toContain('Play');
    await play.click();
    await expect.poll(() => play.innerText(), { timeout: 15_000 }).toContain('Stop');
    await play.click();
    await expect.poll(() => play.innerText()).toContain('Play');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should explain when no octave of the pattern fits the instrument', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    // The engine's school range for the trumpet is written F#3–C6 (Adler's range, narrowed at
    // the top); two octaves of its written D major need D3–D5 or D4–D6, and neither fits.
    await signInAs(
      page,
      e2e.app.url,
      demoEmail('director.hpms'),
      '/practice?tonic=C&mode=major&pattern=cycle-broad&tempo=100&octaves=2&instrument=trumpet',
    );
    const state = page.getByTestId('range-error');
    await expect
      .poll(() => state.innerText())
      .toContain('fits the Trumpet range of written F♯3 to C6');
    await page.getByRole('button', { name: 'Try one octave' }).click();
    await expect
      .poll(() => page.getByTestId('sheet-caption').innerText())
      .toContain('written D major for B♭ trumpet');
    await context.close();
  });

  it('should place the pattern by the player’s level and print the name, date and requirement line', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    // Two octaves of concert C for piccolo reach written C7 (common practice, no source): beyond
    // the middle-school range, within the instrument's full range.
    await signInAs(
      page,
      e2e.app.url,
      demoEmail('student.hpms'),
      '/practice?tonic=C&mode=major&pattern=cycle-broad&tempo=100&octaves=2&instrument=piccolo&level=middle',
    );
    const state = page.getByTestId('range-error');
    await expect
      .poll(() => state.innerText(), { timeout: 10_000 })
      .toContain('Cannot fit this level');
    expect(await state.innerText()).toContain('C7');
    await page.getByTestId('field-level').click();
    await page.getByRole('option', { name: 'Full range of the instrument' }).click();
    await expect
      .poll(() => page.getByTestId('sheet-caption').innerText(), { timeout: 10_000 })
      .toContain('Concert C major');
    expect(page.url()).not.toContain('level=');

    // Printed: the student's own name, today's date and the requirement in one line.
    const me = (await page.evaluate(async () => (await fetch('/api/me')).json())) as {
      name: string;
    };
    await page.emulateMedia({ media: 'print' });
    const lines = page.getByTestId('print-lines');
    await expect.poll(() => lines.isVisible()).toBe(true);
    const printed = await lines.innerText();
    expect(printed).toContain(`Name: ${me.name}`);
    expect(printed).toMatch(/Date: [A-Z][a-z]+ \d{1,2}, \d{4}/);
    expect(await page.getByTestId('requirement-line').innerText()).toBe(
      'Requirement · concert C major · Scale and arpeggio, broad (half and quarter notes) · ♩ = 100 · Tongue (or bow) every note · two octaves',
    );
    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: path.join(screenshotFolder, 'practice-sheet-print.png') });
    await page.emulateMedia({ media: 'screen' });
    expect(await lines.isVisible()).toBe(false);
    await context.close();
  });
});
