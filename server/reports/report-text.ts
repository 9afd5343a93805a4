import type { DirectorReportData, DistrictReportData } from '@shared/api/report';
import {
  countChange,
  figureRows,
  figureText,
  gradeLabel,
  percent,
  reportSubject,
  shareChange,
} from './report-format';

function underline(title: string): string {
  return `${title}\n${'-'.repeat(title.length)}`;
}

function lines(rows: { label: string; value: string | number }[]): string {
  const width = Math.max(0, ...rows.map((row) => row.label.length));
  return rows.map((row) => `  ${row.label.padEnd(width)}  ${row.value}`).join('\n');
}

function studentLines(list: DirectorReportData['stalled']): string {
  if (!list.available) return `  ${list.reason}`;
  if (list.students.length === 0) return `  ${list.rule} Nobody at the moment.`;
  return [
    `  ${list.rule}`,
    ...list.students.map(
      (student) =>
        `  - ${student.name}, ${gradeLabel(student.grade)}, rung ${student.rung} (benchmark ${student.benchmarkRung ?? 'none'}), last pass-off ${student.lastPassOffOn ?? 'never'}`,
    ),
  ].join('\n');
}

/** The plain-text part of a director report. */
export function directorReportText(data: DirectorReportData): string {
  const { enrolment, ladder, passOffs, fleet } = data;
  const sections = [
    reportSubject(data),
    '',
    underline('Enrolment'),
    `  ${enrolment.students} active students.`,
    'By ensemble:',
    lines(enrolment.byEnsemble.map((row) => ({ label: row.label, value: row.students }))),
    'By instrument:',
    lines(enrolment.byInstrument.map((row) => ({ label: row.label, value: row.students }))),
    '',
    underline('Scale ladder'),
  ];
  if (ladder.available) {
    sections.push(
      `  At or above benchmark: ${percent(ladder.share)}`,
      'Students by rung:',
      lines(
        ladder.byRung.map((row) => ({
          label: row.rung === 0 ? 'Not started' : `Rung ${row.rung}`,
          value: row.students,
        })),
      ),
      'At or above benchmark, by grade:',
      lines(
        ladder.byGrade.map((row) => ({
          label: `${gradeLabel(row.grade)} (benchmark ${row.benchmarkRung ?? 'none'})`,
          value:
            row.share === null
              ? '–'
              : `${percent(row.share)} (${row.atOrAbove} of ${row.students})`,
        })),
      ),
    );
  } else {
    sections.push(`  ${ladder.reason}`);
  }
  sections.push('', underline('Pass-offs in the period'));
  sections.push(
    passOffs.available
      ? `  ${passOffs.heard} heard, ${passOffs.passed} passed, by ${passOffs.students} students.`
      : `  ${passOffs.reason}`,
  );
  sections.push('', underline('Stalled students'), studentLines(data.stalled));
  sections.push('', underline('Audition-ready students'), studentLines(data.auditionReady));
  sections.push('', underline('Instruments'));
  if (fleet.available) {
    sections.push(
      lines([
        { label: 'Out on loan', value: fleet.out },
        { label: 'Overdue', value: fleet.overdue },
        { label: 'In repair', value: fleet.inRepair },
        { label: 'Unsigned agreements', value: fleet.unsigned },
      ]),
    );
    for (const loan of fleet.loans.filter((each) => each.overdue || !each.signed)) {
      sections.push(
        `  - ${loan.assetTag} ${loan.instrument}, ${loan.student}, due ${loan.dueOn}${loan.overdue ? ', OVERDUE' : ''}${loan.signed ? '' : ', agreement unsigned'}`,
      );
    }
  } else {
    sections.push(`  ${fleet.reason}`);
  }
  sections.push('', 'The attached CSV and XLSX files hold every row.');
  return `${sections.join('\n')}\n`;
}

/** The plain-text part of the district summary. */
export function districtReportText(data: DistrictReportData): string {
  const sections = [reportSubject(data), ''];
  const blocks = [
    ...data.schools.map((school) => ({
      title: `${school.code} ${school.name}`,
      figures: school.figures,
    })),
    { title: 'District', figures: data.totals },
  ];
  for (const block of blocks) {
    sections.push(underline(block.title));
    sections.push(
      lines(
        figureRows.map(({ field, label }) => ({ label, value: figureText(block.figures, field) })),
      ),
    );
    sections.push('');
  }
  if (data.previous) {
    const previous = data.previous;
    sections.push(underline(`Change since the summary for ${previous.from} to ${previous.to}`));
    sections.push(
      lines(
        figureRows.map(({ field, label, share }) => ({
          label,
          value: share
            ? shareChange(data.totals[field], previous.totals[field])
            : countChange(data.totals[field], previous.totals[field]),
        })),
      ),
    );
  } else {
    sections.push('This is the first district summary: there is nothing to compare with yet.');
  }
  return `${sections.join('\n')}\n`;
}
