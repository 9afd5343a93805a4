import { instruments } from '@shared/music/instrument-data';

/**
 * The accessories that usually travel with a school instrument, by family (common practice, no
 * source). Mouthpieces and reeds are listed because a district may lend a new one to keep; a used
 * one is never passed from player to player.
 */
const byFamily: Record<string, string[]> = {
  woodwind: ['case', 'mouthpiece', 'ligature', 'reeds', 'neck strap', 'cap', 'cleaning swab'],
  brass: ['case', 'mouthpiece', 'mutes', 'lyre', 'valve oil', 'slide grease'],
  strings: ['case', 'bow', 'rosin', 'shoulder rest', 'rock stop'],
  percussion: ['case', 'sticks', 'mallets', 'stand', 'practice pad'],
};

/** The accessory choices for an instrument kind; every family's when none is chosen yet. */
export function accessoriesFor(instrumentId: string | null): string[] {
  const family = instruments.find((kind) => kind.id === instrumentId)?.family;
  if (family) return byFamily[family] ?? ['case'];
  return [...new Set(Object.values(byFamily).flat())];
}
