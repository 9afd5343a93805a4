import { describe, expect, it } from 'vitest';
import { passOffInputSchema } from '@shared/api/pass-off';
import { tempoPresets } from './tempo-presets';

describe('tempoPresets', () => {
  it('should offer the requirement tempo with two steps below and one above', () => {
    expect(tempoPresets(100)).toEqual([84, 92, 100, 108]);
  });

  it('should keep every preset within the range the pass-off input accepts', () => {
    for (const tempo of [20, 30, 296, 300]) {
      for (const preset of tempoPresets(tempo)) {
        const parsed = passOffInputSchema.safeParse({
          studentId: 1,
          requirementCode: 'r1-1',
          heardOn: '2026-10-01',
          tempo: preset,
          passed: true,
        });
        expect(parsed.success, `${preset} for ${tempo}`).toBe(true);
      }
    }
    expect(tempoPresets(20)).toEqual([20, 28]);
  });
});
