import { instruments } from '@shared/music/index';

const names = new Map(instruments.map((instrument) => [instrument.id, instrument.name]));
const scorePositions = new Map(
  instruments.map((instrument, position) => [instrument.id, position]),
);

/** The instrument's name for an id, or null when there is no instrument. */
export function instrumentName(id: string | null): string | null {
  if (id === null) return null;
  return names.get(id) ?? id;
}

/** Where an instrument stands in score order (woodwinds, brass, percussion, strings). */
export function scorePosition(id: string | null): number {
  return (id === null ? undefined : scorePositions.get(id)) ?? instruments.length;
}
