import { describe, expect, it } from 'vitest';
import { commitActivity, importDoneSentence } from './import-words';

describe('importDoneSentence', () => {
  it('should count the skipped rows, not their errors, when rows had several errors', () => {
    // Five errors on four rows: 16 rows, 12 of them imported.
    const result = {
      rows: 16,
      created: 3,
      updated: 1,
      unchanged: 8,
      withdrawn: 1,
      errors: Array.from({ length: 5 }, (_, index) => ({
        line: 2 + Math.min(index, 3),
        column: 'grade',
        message: 'Grade must be K or 1–12.',
      })),
      committed: true,
    };
    expect(importDoneSentence(result)).toBe(
      '3 rows added new students, 1 changed student, 8 unchanged, 1 student was marked withdrawn; 4 rows with errors were skipped.',
    );
  });

  it('should write the singular and leave out the skipped rows when there are none', () => {
    expect(
      importDoneSentence({
        rows: 3,
        created: 1,
        updated: 2,
        unchanged: 0,
        withdrawn: 0,
        errors: [],
        committed: true,
      }),
    ).toBe(
      '1 row added a new student, 2 changed students, 0 unchanged, 0 students were marked withdrawn.',
    );
  });
});

describe('commitActivity', () => {
  it('should name each kind of write the plan holds', () => {
    expect(commitActivity({ created: 2, updated: 1, withdrawn: 0, newEnsembles: [{}] })).toBe(
      'Adding 2 rows of new students, writing 1 changed row, creating 1 ensemble… Nothing changes until the whole import is written.',
    );
  });
});
