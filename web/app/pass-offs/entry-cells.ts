import type { LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import { appliesToFamily } from '../ladder/requirement-text';
import type { EntryStatus, QueueEntry } from './pass-off-queue';
import { escapeHtml } from '@shared/html/escape-html';

/** A pass-off being typed into a cell, before it joins the queue. */
export interface CellDraft {
  clientKey: string;
  /** null until P or N is pressed. */
  passed: boolean | null;
  /** The digits typed; empty means the requirement's own tempo. */
  typedTempo: string;
  note: string;
  /** Why the draft cannot be sent yet. */
  problem: string;
}

/** What one cell of the entry grid shows. */
export type CellView =
  | { kind: 'not-asked' }
  | { kind: 'empty' }
  | { kind: 'draft'; passed: boolean | null; tempo: number; problem: string }
  | { kind: 'entry'; status: EntryStatus; passed: boolean; tempo: number; message: string }
  | { kind: 'heard'; passOff: PassOff; earlierLadder: boolean };

/** The grid key of one student's cell for one requirement. */
export function cellKey(studentId: number, requirementCode: string): string {
  return `${studentId}|${requirementCode}`;
}

/** The tempo a draft stands for: the digits typed, else the requirement's own. */
export function draftTempo(draft: CellDraft, requirement: LadderRequirement): number {
  return draft.typedTempo === '' ? requirement.tempo : Number(draft.typedTempo);
}

/** What the cells of the entry grid are drawn from, each by cell key. */
export interface CellSources {
  /** What is being typed. */
  drafts: ReadonlyMap<string, CellDraft>;
  /** The queue's latest entry. */
  entries: ReadonlyMap<string, QueueEntry>;
  /** The pass-offs on record, latest first. */
  heard: ReadonlyMap<string, readonly PassOff[]>;
  /** The id of the ladder in force. */
  ladderId: number | undefined;
}

/**
 * What a student's cell for a requirement shows: not asked of the student's section, else what
 * is being typed, else the queue's entry, else the standing pass-off on record.
 */
export function cellViewOf(
  row: { studentId: number; family: string | null },
  requirement: LadderRequirement,
  sources: CellSources,
): CellView {
  if (!appliesToFamily(requirement, row.family)) return { kind: 'not-asked' };
  const key = cellKey(row.studentId, requirement.code);
  const draft = sources.drafts.get(key);
  if (draft) {
    const tempo = draftTempo(draft, requirement);
    return { kind: 'draft', passed: draft.passed, tempo, problem: draft.problem };
  }
  const entry = sources.entries.get(key);
  if (entry) {
    const { status, passOff, message } = entry;
    return { kind: 'entry', status, passed: passOff.passed, tempo: passOff.tempo, message };
  }
  const heard = standingPassOff(sources.heard.get(key) ?? []);
  if (!heard) return { kind: 'empty' };
  return {
    kind: 'heard',
    passOff: heard,
    earlierLadder: heard.ladderVersionId !== sources.ladderId,
  };
}

/**
 * The pass-off a cell shows from the record: one that counts (the fastest), else a pass that
 * no longer counts, else the latest "not yet".
 */
export function standingPassOff(passOffs: readonly PassOff[]): PassOff | null {
  const counting = passOffs.filter((passOff) => passOff.standing === 'counts');
  if (counting.length)
    return counting.reduce((best, passOff) => (passOff.tempo > best.tempo ? passOff : best));
  const stale = passOffs.find((passOff) => passOff.passed);
  if (stale) return stale;
  return passOffs[0] ?? null;
}

const statusText: Record<EntryStatus, string> = {
  waiting: 'waiting to send…',
  saving: 'saving…',
  saved: 'saved ✓',
  failed: '⚠ failed',
};

function result(passed: boolean, tempo: number): string {
  return passed
    ? `<span class="result passed">✓ Passed ♩${tempo}</span>`
    : `<span class="result not-yet">✕ Not yet ♩${tempo}</span>`;
}

/** The marker of a cell with a take the student sent: a note sign and words, not colour alone. */
const takeMarker =
  '<span class="take-marker" title="Take sent: the student sent a take, open the cell to hear it" aria-label="take sent">♪ take</span>';

/** The cell's HTML, with the take marker when the student sent a take of it. */
export function cellHtml(view: CellView, requirement: LadderRequirement, takeSent = false): string {
  const html = cellContent(view, requirement);
  return takeSent && view.kind !== 'not-asked'
    ? `<span class="with-take">${html}${takeMarker}</span>`
    : html;
}

/** The cell's content: a result line that never relies on colour alone, and a status line. */
function cellContent(view: CellView, requirement: LadderRequirement): string {
  switch (view.kind) {
    case 'not-asked':
      return '<span class="not-asked" title="Not asked of this section">—</span>';
    case 'empty':
      return '';
    case 'draft': {
      const line =
        view.passed === null
          ? `<span class="result typing">♩${view.tempo || '…'}</span>`
          : result(view.passed, view.tempo);
      const status = view.problem
        ? `⚠ ${escapeHtml(view.problem)}`
        : view.passed === null
          ? 'P passed · N not yet'
          : 'entering…';
      return `<span class="cell draft">${line}<span class="status">${status}</span></span>`;
    }
    case 'entry':
      return `<span class="cell entry ${view.status}" title="${escapeHtml(view.message)}">${result(view.passed, view.tempo)}<span class="status">${statusText[view.status]}</span></span>`;
    case 'heard': {
      const { passOff } = view;
      if (passOff.standing === 'counts' || passOff.standing === 'not-yet') {
        return `<span class="cell heard">${result(passOff.passed, passOff.tempo)}</span>`;
      }
      const why = view.earlierLadder
        ? 'earlier ladder · no longer counts'
        : `below ♩${requirement.tempo} · does not count`;
      return `<span class="cell heard stale" title="${escapeHtml(passOff.standingNote ?? why)}"><span class="result stale">✓ ♩${passOff.tempo}</span><span class="status">${why}</span></span>`;
    }
  }
}
