import { describe, expect, it } from 'vitest';
import { instrumentById, instruments } from '@shared/music';
import { familyLabels } from '../../practice/labels';
import { instrumentChoiceGroups } from './instrument-choices';

describe('instrumentChoiceGroups', () => {
  it('should offer every instrument once, under its own family heading, when a select groups them', () => {
    const groups = instrumentChoiceGroups(familyLabels);
    const offered = groups.flatMap((group) => group.choices.map((choice) => choice.value));
    expect(offered.toSorted()).toEqual(instruments.map((instrument) => instrument.id).toSorted());
    for (const group of groups) {
      for (const choice of group.choices) {
        const instrument = instrumentById(choice.value);
        expect(choice.label).toBe(instrument.name);
        expect(group.label).toBe(familyLabels[instrument.family]);
      }
    }
  });
});
