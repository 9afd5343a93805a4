import { instruments } from '@shared/music/index';

/**
 * Instruments heavy or bulky enough to need a wheeled case and, where needed, two people to
 * carry (common practice, no source): tuba, euphonium, baritone saxophone, bass clarinet,
 * double bass, cello, marimba and xylophone.
 */
export const heavyInstrumentIds: readonly string[] = [
  'tuba',
  'euphonium',
  'euphonium-tc',
  'bari-sax',
  'bass-clarinet',
  'double-bass',
  'cello',
  'marimba',
  'xylophone',
];

/** The handling note heavy instruments carry. */
export const heavyHandlingNote =
  'Heavy instrument: move it in its wheeled case, and carry it with two people where needed (stairs, vehicles). Follow the district’s lifting guidance.';

/** The caution a shared wind instrument carries. */
export const windCleaningCaution =
  'Shared wind instrument: mouthpieces and reeds are personal and are never lent with it. A returned instrument is cleaned and sanitised before it is lent again, following the district’s health guidance.';

/** The name the music engine gives an instrument kind, or its id when it knows none. */
export function instrumentNameOf(instrumentId: string): string {
  return instruments.find((instrument) => instrument.id === instrumentId)?.name ?? instrumentId;
}

/** The family (woodwind, brass, percussion, strings) of an instrument kind, or 'other'. */
export function familyOf(instrumentId: string): string {
  return instruments.find((instrument) => instrument.id === instrumentId)?.family ?? 'other';
}

/** The handling note for an instrument kind, or null when it is not heavy. */
export function handlingNoteFor(instrumentId: string): string | null {
  return heavyInstrumentIds.includes(instrumentId) ? heavyHandlingNote : null;
}

/** Whether an instrument kind is blown (woodwind or brass) and so is cleaned between players. */
export function isWindInstrument(instrumentId: string): boolean {
  const family = familyOf(instrumentId);
  return family === 'woodwind' || family === 'brass';
}

/** The cleaning caution for an instrument kind, or null when it is not a wind instrument. */
export function cleaningCautionFor(instrumentId: string): string | null {
  return isWindInstrument(instrumentId) ? windCleaningCaution : null;
}

/** Every caution that applies to an instrument kind. */
export function cautionsFor(instrumentId: string): string[] {
  return [handlingNoteFor(instrumentId), cleaningCautionFor(instrumentId)].filter(
    (caution): caution is string => caution !== null,
  );
}
