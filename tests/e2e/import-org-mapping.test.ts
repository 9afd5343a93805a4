import { strToU8, zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { useBrowserApp } from '../support/browser-app';
import { chooseOption, saveScreenshot } from '../support/browser';
import { bulkRosterManifest } from '../fixtures/rosters/oneroster-manifest';

const e2e = useBrowserApp();

const crlf = (lines: string[]) => strToU8(`${lines.join('\r\n')}\r\n`);

/**
 * A small invented OneRoster 1.1 CSV bundle (1EdTech OneRoster 1.1 CSV Tables: manifest.csv,
 * orgs.csv, academicSessions.csv, courses.csv, classes.csv, users.csv, enrollments.csv). Of its
 * three schools only Heron Point Middle matches one of the demo district's by identifier;
 * "Saltmarsh Campus" and "Wrenfield Academy" match none, by identifier or name.
 */
const bundle = Buffer.from(
  zipSync({
    'manifest.csv': crlf(bulkRosterManifest),
    'orgs.csv': crlf([
      'sourcedId,status,dateLastModified,name,type,identifier,parentSourcedId',
      'org-d,,,Merrow Basin Unified,district,MBU,',
      'org-hp,,,Heron Point Middle,school,HPMS,org-d',
      'org-smc,,,Saltmarsh Campus,school,SMC-7,org-d',
      'org-wfa,,,Wrenfield Academy,school,WFA.01,org-d',
    ]),
    'academicSessions.csv': crlf([
      'sourcedId,status,dateLastModified,title,type,startDate,endDate,parentSourcedId,schoolYear',
      'term-2026,,,2026-2027,schoolYear,2026-08-17,2027-06-11,,2027',
    ]),
    'courses.csv': crlf([
      'sourcedId,status,dateLastModified,schoolYearSourcedId,title,courseCode,grades,orgSourcedId,subjects,subjectCodes',
      'course-band,,,term-2026,Band,MUS-BAND,"06,07,08",org-d,Music,',
    ]),
    'classes.csv': crlf([
      'sourcedId,status,dateLastModified,title,grades,courseSourcedId,classCode,classType,location,schoolSourcedId,termSourcedIds,subjects,subjectCodes,periods',
      'class-hp,,,Concert Band,"07,08",course-band,HP-CB,scheduled,Band Room,org-hp,term-2026,Music,,2',
      'class-smc,,,Concert Band,"07,08",course-band,SM-CB,scheduled,Room 3,org-smc,term-2026,Music,,1',
      'class-wfa,,,Beginning Band,06,course-band,WF-BB,scheduled,Hall,org-wfa,term-2026,Music,,4',
    ]),
    'users.csv': crlf([
      'sourcedId,status,dateLastModified,enabledUser,orgSourcedIds,role,username,userIds,givenName,familyName,middleName,identifier,email,sms,phone,agentSourcedIds,grades,password',
      'u-1,,,true,org-hp,student,,,Oriel,Pennywhistle,,OM-7001,,,,,07,',
      'u-2,,,true,org-smc,student,,,Tamsin,Greaveley,,OM-7002,,,,,08,',
      'u-3,,,true,org-wfa,student,,,Corin,Ashgrove,,OM-7003,,,,,06,',
    ]),
    'enrollments.csv': crlf([
      'sourcedId,status,dateLastModified,classSourcedId,schoolSourcedId,userSourcedId,role,primary,beginDate,endDate',
      'e-1,,,class-hp,org-hp,u-1,student,false,2026-08-17,2027-06-11',
      'e-2,,,class-smc,org-smc,u-2,student,false,2026-08-17,2027-06-11',
      'e-3,,,class-wfa,org-wfa,u-3,student,false,2026-08-17,2027-06-11',
    ]),
  }),
);

async function schoolOf(studentNumber: string): Promise<string | undefined> {
  const rows = rowsOf<{ code: string }>(
    await e2e.app.database.db.execute(
      `select schools.code from students join schools on schools.id = students.school_id
       where students.student_number = '${studentNumber}'` as never,
    ),
  );
  return rows[0]?.code;
}

describe('Roster import wizard: OneRoster orgs that match no school', () => {
  it('should list the unmapped orgs, map one to a school and create another, re-preview and import', async () => {
    const { context, outside, page } = await e2e.signedInPage('coordinator', {
      path: '/imports',
      viewport: { width: 1280, height: 900 },
    });
    await page.waitForURL(`${e2e.app.url}/imports`);

    await page.getByTestId('roster-file').setInputFiles({
      name: 'saltmarsh-export.zip',
      mimeType: 'application/zip',
      buffer: bundle,
    });
    const table = page.getByTestId('org-mapping');
    await table.waitFor();
    // The step is named for what a bundle needs mapped: its orgs, not its columns.
    expect(await page.locator('mat-step-header').allInnerTexts()).toEqual(
      expect.arrayContaining([expect.stringContaining('Map schools')]),
    );
    const listed = await table.locator('tbody tr').allInnerTexts();
    expect(listed).toHaveLength(2);
    expect(listed[0]).toContain('Saltmarsh Campus');
    expect(listed[0]).toContain('identifier SMC-7');
    expect(listed[0]).toContain('org-smc');
    expect(listed[0]).toContain('school');
    expect(listed[1]).toContain('Wrenfield Academy');
    expect(listed[1]).toContain('org-wfa');

    // Nothing can be saved until every org has its school.
    const save = page.getByTestId('save-org-mapping');
    expect(await save.isDisabled()).toBe(true);
    await chooseOption(page, 'org-school-org-smc', /Quarry Hill Middle \(QHMS\)/);
    await page.locator('.mat-mdc-select-panel').waitFor({ state: 'detached' });
    expect(await save.isDisabled()).toBe(true);

    // Wrenfield Academy is not one of the district's schools yet: create it from the step.
    await page
      .locator('tr[data-org="org-wfa"]')
      .getByRole('button', { name: 'Not listed? Create the school' })
      .click();
    const code = page.getByTestId('new-school-code');
    // The code is proposed from the org's identifier, without the characters a code cannot have.
    expect(await code.inputValue()).toBe('WFA01');
    await page
      .locator('tr[data-org="org-wfa"]')
      .getByRole('button', { name: 'Create the school' })
      .click();
    await expect
      .poll(() => page.getByTestId('org-school-org-wfa').innerText())
      .toContain('Wrenfield Academy (WFA01)');
    await expect.poll(() => save.isDisabled()).toBe(false);
    // The label floats above the chosen school once the outline has opened its notch for it
    // (Material's float transition is 150 ms); the picture waits for that.
    await page.locator('tr[data-org="org-wfa"] .mdc-notched-outline--notched').waitFor();
    await page.waitForTimeout(300);
    await saveScreenshot(page, 'import-org-mapping');

    await save.click();
    // Saved, the bundle is read again and the wizard goes on to the preview, without errors.
    await expect
      .poll(() => page.getByTestId('plan-counts').innerText())
      .toContain('3\nrows add new students');
    expect(await page.getByText('Every row passed its checks.').count()).toBe(1);
    expect(await table.count()).toBe(0);

    const mappings = await page.evaluate(async () => {
      const response = await fetch('/api/oneroster/org-mappings');
      return (await response.json()) as {
        rows: { sourcedId: string; schoolCode: string; chosen: boolean }[];
      };
    });
    expect(
      mappings.rows
        .filter((row) => row.chosen)
        .map((row) => [row.sourcedId, row.schoolCode])
        .sort(),
    ).toEqual([
      ['org-smc', 'QHMS'],
      ['org-wfa', 'WFA01'],
    ]);

    await page.getByRole('button', { name: 'Continue' }).click();
    const commit = page.getByTestId('commit');
    await commit.waitFor();
    await expect.poll(() => commit.isDisabled()).toBe(false);
    await commit.click();
    await expect
      .poll(() => page.getByTestId('import-result').innerText())
      .toContain('3 rows added new students');
    expect(await schoolOf('OM-7001')).toBe('HPMS');
    expect(await schoolOf('OM-7002')).toBe('QHMS');
    expect(await schoolOf('OM-7003')).toBe('WFA01');
    await saveScreenshot(page, 'import-org-mapping-done');
    expect(outside).toEqual([]);
    await context.close();
  });
});
