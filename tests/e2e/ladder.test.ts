import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import { instrumentById } from '@shared/music/index';

const e2e = useBrowserApp();

const patient = { timeout: 15_000 };

function appliesTo(requirement: LadderRequirement, family: string): boolean {
  return !requirement.families || (requirement.families as string[]).includes(family);
}

/** The path and query a requirement's practice-sheet link should carry for an instrument. */
function practicePath(requirement: LadderRequirement, instrument: string): string {
  const query = new URLSearchParams({
    tonic: requirement.tonic,
    mode: requirement.mode,
    pattern: requirement.pattern,
    tempo: String(requirement.tempo),
    articulation: requirement.articulation,
    octaves: String(requirement.octaves),
    instrument,
  });
  return `/practice?${query}`;
}

describe('Scale ladder screen', () => {
  it('should show the demo ladder with its rungs and link each scale to its practice sheet', async () => {
    const director = await e2e.app.signIn(demoEmail('director.hpms'));
    const ladder = (await director.get('/api/ladder')).body as Ladder;
    expect(ladder.rungs).toHaveLength(7);

    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/ladder');
    await page.waitForURL(`${e2e.app.url}/ladder`);
    await expect.poll(() => page.getByTestId('rung').count(), patient).toBe(7);
    expect(await page.locator('nav[aria-label="Main"] a.item').allInnerTexts()).toEqual(
      expect.arrayContaining(['Scale ladder', 'Pass-offs']),
    );

    // Staff read the ladder for a clarinet until they pick another instrument.
    const firstForWinds = ladder.rungs[0]!.requirements.find((requirement) =>
      appliesTo(requirement, 'woodwind'),
    )!;
    const firstLink = page.getByTestId('rung').first().getByTestId('requirement-link').first();
    expect(await firstLink.getAttribute('href')).toBe(practicePath(firstForWinds, 'clarinet'));
    const shownInRungOne = await page
      .getByTestId('rung')
      .first()
      .getByTestId('requirement')
      .count();
    expect(shownInRungOne).toBe(
      ladder.rungs[0]!.requirements.filter((requirement) => appliesTo(requirement, 'woodwind'))
        .length,
    );

    // The benchmark table has one row per grade the ladder sets a benchmark for.
    const grades = new Set(ladder.benchmarks.map((benchmark) => benchmark.grade));
    expect(await page.getByTestId('benchmark-table').locator('tbody tr').count()).toBe(grades.size);

    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'ladder');

    await page.getByTestId('instrument-picker').click();
    await page.getByRole('option', { name: 'Cello', exact: true }).click();
    const firstForStrings = ladder.rungs[0]!.requirements.find((requirement) =>
      appliesTo(requirement, 'strings'),
    )!;
    await expect
      .poll(() => firstLink.getAttribute('href'), patient)
      .toBe(practicePath(firstForStrings, 'cello'));

    await firstLink.click();
    await page.waitForURL((url) => url.pathname === '/practice');
    expect(new URL(page.url()).searchParams.get('instrument')).toBe('cello');
    expect(new URL(page.url()).searchParams.get('tonic')).toBe(firstForStrings.tonic);
    expect(outside).toEqual([]);
    await context.close();
  });

  it("should show a student their own rung and practice links for their instrument, and nobody else's page", async () => {
    const student = await e2e.app.signIn(demoEmail('student.hpms'));
    const me = (await student.get('/api/me')).body as { studentId: number };
    const progress = (await student.get(`/api/analytics/students/${me.studentId}/progress`)).body;
    expect(progress.rungCount).toBe(7);

    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('student.hpms'));
    await page.waitForURL(`${e2e.app.url}/students/${me.studentId}`);
    const expected =
      progress.rung === 0 ? /^Not on a rung yet/ : new RegExp(`^Rung ${progress.rung} of 7`);
    await expect
      .poll(() => page.getByTestId('progress-rung').innerText(), patient)
      .toMatch(expected);
    expect(await page.getByTestId('progress-student').innerText()).toBe('My progress');
    expect(await page.locator('.tb-page-header p').innerText()).toContain(progress.studentName);
    // A student has no roster access, so no link to the record.
    expect(await page.getByTestId('student-record').count()).toBe(0);

    const nextLinks = page.getByTestId('next-requirement').locator('a');
    expect(await nextLinks.count()).toBe(progress.next.requirements.length);
    if (progress.next.requirements.length > 0) {
      // The student's own links name the requirement, so a take can be sent for it.
      const next = progress.next.requirements[0];
      expect(await nextLinks.first().getAttribute('href')).toBe(
        `${practicePath(next, progress.instrumentId)}&requirementCode=${encodeURIComponent(next.code)}`,
      );
    }
    expect(await page.getByTestId('progress-history').locator('tbody tr').count()).toBe(
      progress.history.length,
    );
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'student-progress');

    // The rail's ladder reads for the student's own instrument.
    await page.locator('nav[aria-label="Main"] a.item', { hasText: 'Scale ladder' }).click();
    await expect.poll(() => page.getByTestId('rung').count(), patient).toBe(7);
    const instrumentName = instrumentById(progress.instrumentId).name.toLowerCase();
    expect(await page.locator('.for-me').innerText()).toContain(instrumentName);

    await page.goto(`${e2e.app.url}/students/${me.studentId + 1}`);
    await expect.poll(() => page.getByTestId('progress-not-found').isVisible(), patient).toBe(true);
    expect(await page.getByTestId('progress-not-found').innerText()).toContain(
      'only your own progress page',
    );
    await context.close();
  });

  it('should let the coordinator edit a draft, show the server’s field messages, and publish it', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/ladder');
    await page.getByTestId('start-draft').click();
    await page.waitForURL(/\/ladder\/versions\/\d+\/edit$/);
    await expect.poll(() => page.getByTestId('rung-editor').count(), patient).toBe(7);
    // The demo ladder expects grade 10 to reach rung 5, whose two-octave concert F takes the
    // horn to written C6, beyond a high-school horn (common practice, no source).
    const reach = page.getByTestId('reach-warnings');
    await reach.locator('summary').click();
    await expect.poll(() => reach.innerText()).toContain('Rung 5, concert F major (two octaves)');
    expect(await reach.innerText()).toContain('French Horn: Cannot fit this level');
    await reach.scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'ladder-editor-reach');

    // At 1,440 px every field of a requirement shows whole: no column cut off, no label or value
    // ended with an ellipsis.
    const cut = await page.evaluate(() => {
      const found: string[] = [];
      const all = (root: ParentNode, selector: string) =>
        Array.from(root.querySelectorAll(selector)) as HTMLElement[];
      for (const rung of all(document, '[data-testid=rung-editor]')) {
        if (rung.scrollWidth > rung.clientWidth + 1)
          found.push(`rung overflows by ${rung.scrollWidth - rung.clientWidth}px`);
        const rungBox = rung.getBoundingClientRect();
        for (const field of all(rung, '.requirement > *')) {
          const box = field.getBoundingClientRect();
          if (box.right > rungBox.right + 1) found.push(`${field.className} past the card`);
        }
        for (const text of all(
          rung,
          '.requirement mat-label, .requirement .mat-mdc-select-value-text, .requirement input',
        )) {
          if (text.scrollWidth > text.clientWidth + 1)
            found.push(`cut: ${text.textContent || (text as HTMLInputElement).value}`);
        }
      }
      return found;
    });
    expect(cut).toEqual([]);
    await saveScreenshot(page, 'ladder-editor-1440');

    // "Add a requirement" adds an empty one, not a copy of the one above; saving it asks for a key.
    const firstRung = page.getByTestId('rung-editor').first();
    const before = await firstRung.locator('.requirement').count();
    await firstRung.getByRole('button', { name: 'Add a requirement' }).click();
    await expect.poll(() => firstRung.locator('.requirement').count(), patient).toBe(before + 1);
    const added = firstRung.locator('.requirement').last();
    expect(await added.locator('.tonic .mat-mdc-select-value').innerText()).toBe('Choose');
    expect(await added.locator('.code input').inputValue()).toBe('');
    await page.getByTestId('save-draft').click();
    await expect
      .poll(() => added.locator('.field-error').first().innerText(), patient)
      .toContain('A tonic is a letter');
    await added.locator('button.remove').click();
    await expect.poll(() => firstRung.locator('.requirement').count(), patient).toBe(before);

    const tempo = page.getByTestId('rung-editor').first().locator('input[type=number]').first();
    await tempo.fill('10');
    await tempo.dispatchEvent('change');
    await page.getByTestId('save-draft').click();
    // The message is the server's own (requirementTempoRange in shared/api/ladder.ts).
    await expect
      .poll(
        () => page.getByTestId('rung-editor').first().locator('.field-error').first().innerText(),
        patient,
      )
      .toContain('Tempo is at least 30.');
    expect(await page.getByTestId('draft-problem').innerText()).toContain('marked ⚠');

    await tempo.fill('66');
    await tempo.dispatchEvent('change');
    await page.getByTestId('save-draft').click();
    await expect
      .poll(() => page.locator('.actions-bar .state').innerText(), patient)
      .toContain('Saved');

    // Publishing shows its impact first: moves by school and grade, names, the benchmark share.
    await page.getByTestId('publish').click();
    const dialog = page.getByRole('dialog');
    await expect
      .poll(() => dialog.getByTestId('impact-summary').innerText(), patient)
      .toMatch(/\d+ students? moves? up, \d+ moves? down and \d+ stays? on the same rung/);
    expect(await dialog.getByTestId('impact-benchmark').innerText()).toMatch(
      /benchmark today: \d+% \(\d+ of \d+\) now, \d+% \(\d+ of \d+\) after/,
    );
    expect(await dialog.innerText()).toContain('no longer exists');
    const nameField = dialog.getByTestId('publish-name');
    expect(await nameField.inputValue()).not.toContain('(draft)');
    await nameField.fill('Ladder 2027 (draft)');
    expect(await dialog.getByTestId('confirm-impact').isDisabled()).toBe(true);
    await nameField.fill('Ladder 2027, rung 1 at 66');
    // A raised tempo only holds students back: the drill-down names those moving down.
    const downButton = dialog.getByTestId('impact-groups').locator('button').first();
    await downButton.click();
    await expect
      .poll(() => dialog.getByTestId('impact-names').locator('li').count(), patient)
      .toBeGreaterThan(0);
    expect(await dialog.getByTestId('impact-names').innerText()).toMatch(/rung \d → (\d|none)/);
    const droppedNumber = (
      await dialog.getByTestId('impact-names').locator('li .tb-muted').first().innerText()
    ).replace(/[()]/g, '');
    await saveScreenshot(page, 'ladder-publish-impact');
    await dialog.getByTestId('confirm-impact').click();
    await page.waitForURL(`${e2e.app.url}/ladder`);

    const coordinator = await e2e.app.signIn(demoEmail('coordinator'));
    const ladder = (await coordinator.get('/api/ladder')).body as Ladder;
    expect(ladder.rungs[0]!.requirements[0]!.tempo).toBe(66);
    expect(ladder.name).toBe('Ladder 2027, rung 1 at 66');
    await expect
      .poll(() => page.getByTestId('rung').first().locator('.tempo').first().innerText(), patient)
      .toBe('♩ = 66');

    // A pass at ♩ = 60 heard under the old version no longer counts, and the student's page says so.
    const code = ladder.rungs[0]!.requirements[0]!.code;
    const slow = (
      await coordinator.get(
        `/api/pass-offs?requirementCode=${code}&passed=true&sort=tempo:asc&limit=1`,
      )
    ).body.rows[0];
    expect(slow.tempo).toBeLessThan(66);
    expect(slow.standing).toBe('below-tempo');
    await page.goto(`${e2e.app.url}/students/${slow.studentId}`);
    await expect
      .poll(() => page.locator('.notes').innerText(), patient)
      .toContain(slow.standingNote);
    expect(await page.getByTestId('progress-history').locator('tr.stale').count()).toBeGreaterThan(
      0,
    );
    // A student the impact named as moving down reads why on their page.
    const dropped = (await coordinator.get(`/api/students?q=${droppedNumber}`)).body.rows[0];
    expect(dropped.studentNumber).toBe(droppedNumber);
    await page.goto(`${e2e.app.url}/students/${dropped.id}`);
    await expect
      .poll(() => page.getByTestId('ladder-change').innerText(), patient)
      .toMatch(/^The ladder changed on .+ in rung 1 now asks for ♩ = 66 \(it was 60\)/);
    await saveScreenshot(page, 'student-ladder-change');

    // Roll back: the version before is put back in force, after its own impact.
    await page.goto(`${e2e.app.url}/ladder`);
    await page.getByTestId('roll-back').click();
    const back = page.getByRole('dialog');
    await expect
      .poll(() => back.getByTestId('impact-summary').innerText(), patient)
      .toMatch(/\d+ students? moves? up/);
    await saveScreenshot(page, 'ladder-roll-back');
    await back.getByTestId('confirm-impact').click();
    await expect
      .poll(async () => ((await coordinator.get('/api/ladder')).body as Ladder).name, patient)
      .not.toBe('Ladder 2027, rung 1 at 66');
    await context.close();
  });
});
