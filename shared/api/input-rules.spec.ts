import { describe, expect, it } from 'vitest';
import { patchSchemaOf, plainText } from './input-rules';

describe('patchSchemaOf', () => {
  const patch = patchSchemaOf({
    name: plainText().min(2, 'Give it a name.'),
    notes: plainText().max(10).default(''),
  });

  it('should leave out a field the change does not send instead of filling in its default', () => {
    expect(patch.parse({ version: 3 })).toEqual({ version: 3 });
    expect(patch.parse({ version: 3, notes: ' kept ' })).toEqual({ version: 3, notes: 'kept' });
  });

  it('should keep each field’s rule and require the version', () => {
    const names = patch.safeParse({ version: 1, name: 'x' });
    expect(names.success).toBe(false);
    expect(names.error?.issues[0]).toMatchObject({ path: ['name'], message: 'Give it a name.' });
    const unversioned = patch.safeParse({ name: 'Room 4' });
    expect(unversioned.error?.issues.map((issue) => issue.path)).toEqual([['version']]);
  });

  it('should refuse a key the record does not have', () => {
    const extra = patch.safeParse({ version: 1, colour: 'red' });
    expect(extra.error?.issues[0]?.code).toBe('unrecognized_keys');
  });
});
