import { instrumentById, toConcert, transpositionSize, type InstrumentSpec } from '@shared/music';
import { withAccidentalSigns } from './labels';

/** How a caption names an instrument in running text where the name alone reads oddly. */
const runningNames: Record<string, string> = {
  horn: 'horn',
  'euphonium-tc': 'treble-clef euphonium',
};

/**
 * The key a transposing instrument is pitched in (the concert note its written C sounds):
 * 'Bb' for the clarinet, 'Eb' for the alto saxophone, 'F' for the horn; undefined for an
 * instrument that sounds as written or only octaves away.
 */
export function pitchedIn(instrumentId: string): string | undefined {
  if (transpositionSize(instrumentId).semitones % 12 === 0) return undefined;
  return toConcert('C4', instrumentId).replace(/-?\d+$/, '');
}

/**
 * The instrument as a player names it in a sentence: 'B♭ clarinet', 'E♭ alto saxophone',
 * 'horn in F' (horns are named by their key after the name, common practice, no source),
 * 'trombone'.
 */
export function instrumentInText(instrumentId: string): string {
  const instrument = instrumentById(instrumentId);
  const name = runningNames[instrument.id] ?? instrument.name.toLowerCase();
  const key = pitchedIn(instrument.id);
  if (!key) return name;
  const sign = withAccidentalSigns(key);
  return instrument.id === 'horn' ? `${name} in ${sign}` : `${sign} ${name}`;
}

/**
 * What an octave transposition adds to a caption: piccolo and xylophone sound an octave
 * higher than written, the glockenspiel two, the double bass an octave lower.
 */
export function octaveNote(instrument: InstrumentSpec): string | undefined {
  const { semitones } = transpositionSize(instrument.id);
  if (semitones === 0 || semitones % 12 !== 0) return undefined;
  const octaves = Math.abs(semitones / 12);
  const distance = octaves === 1 ? 'an octave' : `${octaves} octaves`;
  return `sounds ${distance} ${semitones > 0 ? 'higher' : 'lower'} than written`;
}
