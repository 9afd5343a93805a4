import {
  planListLimit,
  previewRowLimit,
  type ImportPreview,
  type PlanSummary,
  type PreviewRow,
} from '@shared/api/import';
import {
  formatGradeLevel,
  guessMapping,
  mappingProblems,
  rosterFields,
  type RosterField,
  type RosterRow,
} from '@shared/roster';
import type { ImportPlan } from './import-plan';
import { decodeText } from './parse/decode';
import { parseCsvYielding } from './parse/parse-csv';
import type { RowError } from './parse/parsed-roster';

/** The plan's counts and change lists, each list cut to {@link planListLimit} entries. */
export function planSummary(plan: ImportPlan): PlanSummary {
  return {
    ...plan.counts,
    createdStudents: plan.createdStudents.slice(0, planListLimit),
    createdStudentTotal: plan.createdStudents.length,
    updatedStudents: plan.updatedStudents.slice(0, planListLimit),
    updatedStudentTotal: plan.updatedStudents.length,
    withdrawnStudents: plan.withdrawnStudents.slice(0, planListLimit),
    withdrawnStudentTotal: plan.withdrawnStudents.length,
    newEnsembles: plan.newEnsembles.slice(0, planListLimit),
    schoolCodes: plan.schoolCodes,
  };
}

function errorsByLine(errors: RowError[]): Map<number, RowError[]> {
  const byLine = new Map<number, RowError[]>();
  for (const error of errors) {
    const list = byLine.get(error.line) ?? [];
    list.push(error);
    byLine.set(error.line, list);
  }
  return byLine;
}

function cellsOfRow(row: RosterRow): PreviewRow['cells'] {
  const cells: PreviewRow['cells'] = {};
  for (const field of rosterFields) {
    const value = field === 'grade' ? formatGradeLevel(row.grade) : row[field];
    if (value !== undefined) cells[field] = String(value);
  }
  return cells;
}

/** The first rows of a CSV file as it has them, by roster field, each with its errors. */
async function csvPreviewRows(bytes: Uint8Array, plan: ImportPlan): Promise<PreviewRow[]> {
  const { mapping } = plan.parsed;
  const byLine = errorsByLine(plan.errors);
  const mapped = rosterFields.filter((field) => mapping[field]) as RosterField[];
  const { records } = await parseCsvYielding(decodeText(bytes).text, {
    records: previewRowLimit,
  });
  return records.map((record) => {
    const cells: PreviewRow['cells'] = {};
    for (const field of mapped) cells[field] = record.cells[mapping[field]!] ?? '';
    return { line: record.line, cells, errors: byLine.get(record.line) ?? [] };
  });
}

/** What the wizard shows before a commit: the file's columns, its first rows, every error, the plan. */
export async function importPreview(
  upload: { token: string; fileName: string; bytes: Uint8Array },
  plan: ImportPlan,
): Promise<ImportPreview> {
  const { parsed } = plan;
  const csv = parsed.source === 'csv';
  return {
    importToken: upload.token,
    fileName: upload.fileName,
    source: parsed.source,
    headers: parsed.headers,
    mapping: parsed.mapping,
    guessedMapping: csv ? guessMapping(parsed.headers) : parsed.mapping,
    mappingProblems:
      csv && parsed.headers.length > 0 ? mappingProblems(parsed.mapping, parsed.headers) : [],
    rows: csv
      ? parsed.headers.length === 0
        ? []
        : await csvPreviewRows(upload.bytes, plan)
      : parsed.rows
          .slice(0, previewRowLimit)
          .map(({ line, row }) => ({ line, cells: cellsOfRow(row), errors: [] })),
    errors: plan.errors,
    totalRows: parsed.totalRows,
    plan: planSummary(plan),
    ...(parsed.oneRosterVersion
      ? {
          oneRoster: {
            version: parsed.oneRosterVersion,
            delta: parsed.delta !== undefined,
            skipped: parsed.skipped ?? 0,
            unmappedOrgs: parsed.unmappedOrgs ?? [],
          },
        }
      : {}),
  };
}
