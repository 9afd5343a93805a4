import { capabilities } from '@shared/api/capabilities';
import { roles } from '@shared/api/roles';
import { describe, expect, it } from 'vitest';
import { capabilitiesOf } from './policy';

describe('capabilitiesOf', () => {
  it('should grant each capability of the shared list to at least one role', () => {
    const granted = new Set(roles.flatMap((role) => capabilitiesOf(role)));
    expect([...capabilities].filter((capability) => !granted.has(capability))).toEqual([]);
  });
});
