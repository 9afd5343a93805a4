import { describe, expect, it } from 'vitest';
import type { LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import { cellKey, cellViewOf, type CellDraft, type CellSources } from './entry-cells';
import type { QueueEntry } from './pass-off-queue';

const brassOnly: LadderRequirement = {
  code: 'r3-f-major',
  tonic: 'F',
  mode: 'major',
  pattern: 'cycle-broad',
  tempo: 88,
  articulation: 'tongued',
  octaves: 1,
  optional: false,
  families: ['brass'],
};
const trumpet = { studentId: 7, family: 'brass' };
const key = cellKey(trumpet.studentId, brassOnly.code);

const heard = (fields: Partial<PassOff>) =>
  ({ passed: true, tempo: 88, standing: 'counts', ladderVersionId: 2, ...fields }) as PassOff;
const draft: CellDraft = {
  clientKey: 'k1',
  passed: null,
  typedTempo: '',
  note: '',
  problem: '',
};
const entry = {
  passOff: { passed: false, tempo: 80 },
  status: 'waiting',
  message: '',
} as QueueEntry;
const sources = (fields: Partial<CellSources>): CellSources => ({
  drafts: new Map(),
  entries: new Map(),
  heard: new Map(),
  ladderId: 2,
  ...fields,
});

describe('cellViewOf', () => {
  it('should show a requirement as not asked when it names other families than the student’s', () => {
    const view = cellViewOf({ studentId: 8, family: 'strings' }, brassOnly, sources({}));
    expect(view).toEqual({ kind: 'not-asked' });
  });

  it('should show what is being typed before the queue and the record, at the requirement’s tempo when none is typed', () => {
    const view = cellViewOf(
      trumpet,
      brassOnly,
      sources({
        drafts: new Map([[key, draft]]),
        entries: new Map([[key, entry]]),
        heard: new Map([[key, [heard({})]]]),
      }),
    );
    expect(view).toEqual({ kind: 'draft', passed: null, tempo: 88, problem: '' });
  });

  it('should show the queue’s entry before the record', () => {
    const view = cellViewOf(
      trumpet,
      brassOnly,
      sources({ entries: new Map([[key, entry]]), heard: new Map([[key, [heard({})]]]) }),
    );
    expect(view).toEqual({
      kind: 'entry',
      status: 'waiting',
      passed: false,
      tempo: 80,
      message: '',
    });
  });

  it('should show the fastest counting pass-off on record, marked when an earlier ladder heard it', () => {
    const slow = heard({ tempo: 90, ladderVersionId: 1 });
    const fast = heard({ tempo: 100, ladderVersionId: 1 });
    const view = cellViewOf(trumpet, brassOnly, sources({ heard: new Map([[key, [slow, fast]]]) }));
    expect(view).toEqual({ kind: 'heard', passOff: fast, earlierLadder: true });
  });

  it('should show an empty cell when nothing was typed, queued or heard', () => {
    expect(cellViewOf(trumpet, brassOnly, sources({}))).toEqual({ kind: 'empty' });
  });
});
