import { describe, expect, it } from 'vitest';
import { newRequirement } from './draft-model';

describe('newRequirement', () => {
  it('should give an empty requirement, with no key and no code chosen, for every family', () => {
    const requirement = newRequirement();
    expect(requirement.tonic).toBe('');
    expect(requirement.code).toBe('');
    expect(requirement.families).toBeNull();
    expect(requirement.optional).toBe(false);
  });
});
