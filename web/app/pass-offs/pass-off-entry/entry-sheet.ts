import type { EnsembleMember } from '@shared/api/ensemble';
import type { PassOff } from '@shared/api/pass-off';
import { findInstrument } from '@shared/music';
import type { EntryRow } from '../entry-columns';
import { cellKey } from '../entry-cells';
import type { PassOffQueue } from '../pass-off-queue';

/** The grid's rows from the ensemble's seats, in score order, one row per student. */
export function membersToRows(members: readonly EnsembleMember[]): {
  rows: EntryRow[];
  instruments: Map<number, string | null>;
} {
  const rows: EntryRow[] = [];
  const instruments = new Map<number, string | null>();
  for (const member of members) {
    if (!member.active || instruments.has(member.studentId)) continue;
    const instrument = member.instrumentId ? findInstrument(member.instrumentId) : undefined;
    instruments.set(member.studentId, instrument?.id ?? null);
    rows.push({
      studentId: member.studentId,
      name: `${member.preferredName ?? member.firstName} ${member.lastName}`,
      grade: member.gradeLabel,
      instrumentName: member.instrumentName ?? instrument?.name ?? '',
      family: instrument?.family ?? null,
      rung: null,
      rungLoading: true,
    });
  }
  return { rows, instruments };
}

/**
 * Pass-offs grouped by grid cell, newest first in each: by the day heard, then by when each was
 * entered (two devices that entered one cell offline: the later entry first, whichever reached
 * the server first), then by when it was recorded.
 */
export function passOffsByCell(passOffs: readonly PassOff[]): Map<string, PassOff[]> {
  const byCell = new Map<string, PassOff[]>();
  const newestFirst = [...passOffs].sort(
    (a, b) =>
      b.heardOn.localeCompare(a.heardOn) ||
      Date.parse(b.enteredAt) - Date.parse(a.enteredAt) ||
      b.id - a.id,
  );
  for (const passOff of newestFirst) {
    const key = cellKey(passOff.studentId, passOff.requirementCode);
    byCell.set(key, [...(byCell.get(key) ?? []), passOff]);
  }
  return byCell;
}

/** The banner over the grid while entries wait to be saved, or null when all is saved. */
export interface QueueBanner {
  tone: 'offline' | 'retrying' | 'sending';
  message: string;
}

function entries(count: number): string {
  return count === 1 ? '1 entry' : `${count} entries`;
}

/** What the banner says about the queue: offline, retrying, or catching up. */
export function queueBanner(queue: PassOffQueue): QueueBanner | null {
  const pending = queue.pending();
  const they = pending === 1 ? 'it will' : 'they will';
  if (queue.offline()) {
    return {
      tone: 'offline',
      message: pending
        ? `You are offline. ${entries(pending)} waiting to be saved — ${they} be sent when the connection returns.`
        : 'You are offline. Keep entering: entries are kept on this device and sent when the connection returns.',
    };
  }
  if (pending && queue.retryAt() !== null) {
    return {
      tone: 'retrying',
      message: `${entries(pending)} waiting to be saved — the server is not answering, so ${they} be sent again shortly.`,
    };
  }
  if (pending && queue.restored()) {
    return {
      tone: 'sending',
      message: `Sending ${entries(pending)} kept on this device from an earlier visit…`,
    };
  }
  return null;
}
