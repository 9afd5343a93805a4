import { describe, expect, it } from 'vitest';
import type { LadderRequirement } from '@shared/api/ladder';
import { entryColumns } from './entry-columns';

const requirement = (code: string, optional: boolean): LadderRequirement => ({
  code,
  tonic: 'Eb',
  mode: 'major',
  pattern: 'cycle-broad',
  tempo: 72,
  articulation: 'tongued',
  octaves: 1,
  optional,
  families: null,
});

describe('entryColumns', () => {
  it('should mark an optional requirement as optional in its column header, and only it', () => {
    const columns = entryColumns(
      [requirement('r2-eb-major', false), requirement('r2-eb-major-fast', true)],
      () => ({}) as never,
    );
    const required = columns.find((column) => column.colId === 'r2-eb-major')!;
    const optional = columns.find((column) => column.colId === 'r2-eb-major-fast')!;
    expect(required.headerName).toBe('E♭ major ♩72');
    expect(optional.headerName).toBe('E♭ major ♩72 (optional)');
    // A header that wraps rather than cuts the word off.
    expect(optional.wrapHeaderText).toBe(true);
  });
});
