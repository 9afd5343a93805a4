import { instrumentFamilies, instruments, type InstrumentFamily } from '@shared/music';
import type { ChoiceGroup } from './field';

/**
 * Every instrument the music engine knows as a choice of a select (its id, its name), under its
 * family's heading in the words of the screen (`familyLabels`: "Woodwinds" on a practice sheet,
 * "Woodwind" in the fleet).
 */
export function instrumentChoiceGroups(
  familyLabels: Record<InstrumentFamily, string>,
): ChoiceGroup<string>[] {
  return instrumentFamilies.map((family) => ({
    label: familyLabels[family],
    choices: instruments
      .filter((instrument) => instrument.family === family)
      .map((instrument) => ({ value: instrument.id, label: instrument.name })),
  }));
}
