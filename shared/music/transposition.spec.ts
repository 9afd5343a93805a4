import fc from 'fast-check';
import { Note } from 'tonal';
import { describe, expect, it } from 'vitest';
import { instruments } from './instrument-data';
import { transpositionSize } from './instruments';
import { keySignature, majorTonics, minorTonics, type Key, type Mode } from './keys';
import { midi } from './pitch';
import { toConcert, toWritten, writtenKey } from './transposition';

const ids = instruments.map(({ id }) => id);
const concertBb: Key = { tonic: 'Bb', mode: 'major' };
const concertB: Key = { tonic: 'B', mode: 'major' };

const singleAccidentalNote = fc
  .tuple(
    fc.constantFrom('C', 'D', 'E', 'F', 'G', 'A', 'B'),
    fc.constantFrom('', '#', 'b'),
    fc.integer({ min: 1, max: 7 }),
  )
  .map(([letter, accidental, octave]) => `${letter}${accidental}${octave}`);

/** Written keys by section, with the concert key every non-transposing instrument keeps. */
function sectionKeys(concert: Key, bFlat: string, eFlat: string, horn: string) {
  const keys: Record<string, string> = {};
  for (const id of ids) keys[id] = concert.tonic;
  for (const id of [
    'clarinet',
    'bass-clarinet',
    'soprano-sax',
    'tenor-sax',
    'trumpet',
    'euphonium-tc',
  ]) {
    keys[id] = bFlat;
  }
  keys['alto-sax'] = eFlat;
  keys['bari-sax'] = eFlat;
  keys.horn = horn;
  return keys;
}

describe('writtenKey', () => {
  it('should give each section its written key when the requirement is concert Bb major', () => {
    // Common practice, no source (band methods): concert Bb is C for Bb instruments, G for Eb
    // instruments and F for horn in F; the others read Bb.
    const expected = sectionKeys(concertBb, 'C', 'G', 'F');
    for (const id of ids) {
      expect(writtenKey(concertBb, id), id).toEqual({ tonic: expected[id], mode: 'major' });
    }
  });

  it('should respell to the key with fewer accidentals when the requirement is concert B major', () => {
    // Common practice, no source: C# major (7 sharps) is written Db major (5 flats), G# major
    // (8 sharps) Ab major; F# major and Gb major tie at six, so F# stays.
    const expected = sectionKeys(concertB, 'Db', 'Ab', 'F#');
    for (const id of ids) {
      expect(writtenKey(concertB, id), id).toEqual({ tonic: expected[id], mode: 'major' });
    }
  });

  it('should give Db major when the requirement is concert E major for the alto saxophone', () => {
    // Common practice, no source: C# major (7 sharps) against Db major (5 flats).
    expect(writtenKey({ tonic: 'E', mode: 'major' }, 'alto-sax')).toEqual({
      tonic: 'Db',
      mode: 'major',
    });
  });

  it('should keep the plain transposition when tonal finds a standard key with fewer accidentals', () => {
    for (const tonic of majorTonics) {
      for (const id of ids) {
        const written = writtenKey({ tonic, mode: 'major' }, id);
        // tonal (npm) Note.transpose of the tonic, which never respells.
        const plain = Note.pitchClass(Note.transpose(`${tonic}4`, invert(id)));
        const plainSignature = keySignature({ tonic: plain, mode: 'major' });
        if (Math.abs(plainSignature) <= 6) {
          expect(written.tonic, `${tonic} ${id}`).toBe(plain);
        } else {
          expect(Note.chroma(written.tonic), `${tonic} ${id}`).toBe(Note.chroma(plain));
        }
      }
    }
  });

  it('should land on one of the 15 key names when any standard key is transposed', () => {
    const minorModes: Mode[] = ['natural-minor', 'harmonic-minor', 'melodic-minor'];
    for (const id of ids) {
      for (const tonic of majorTonics) {
        const written = writtenKey({ tonic, mode: 'major' }, id);
        // Kostka & Payne, Tonal Harmony: the 15 major key names.
        expect(majorTonics).toContain(written.tonic);
        // Common practice, no source: never more accidentals than the enharmonic twin, so
        // C# major (twin Db) and Cb major (twin B) are never written.
        expect(Math.abs(keySignature(written))).toBeLessThanOrEqual(6);
      }
      for (const tonic of minorTonics) {
        for (const mode of minorModes) {
          const written = writtenKey({ tonic, mode }, id);
          // Kostka & Payne, Tonal Harmony: the 15 minor key names.
          expect(minorTonics).toContain(written.tonic);
          expect(written.mode).toBe(mode);
        }
      }
    }
  });

  it('should transpose minor keys by the same interval when the key is concert G minor', () => {
    // Common practice, no source: concert G minor is A minor for Bb instruments, E minor for Eb.
    expect(writtenKey({ tonic: 'G', mode: 'harmonic-minor' }, 'clarinet').tonic).toBe('A');
    expect(writtenKey({ tonic: 'G', mode: 'natural-minor' }, 'alto-sax').tonic).toBe('E');
    // Common practice, no source: A# minor (7 sharps) against Bb minor (5 flats).
    expect(writtenKey({ tonic: 'C#', mode: 'melodic-minor' }, 'alto-sax').tonic).toBe('Bb');
  });

  it('should throw when the instrument is unknown', () => {
    expect(() => writtenKey(concertBb, 'kazoo')).toThrow(/Unknown instrument/);
  });
});

describe('toWritten', () => {
  it('should give C4 when concert Bb3 is written for the clarinet', () => {
    // Adler, The Study of Orchestration: the Bb clarinet sounds a major 2nd below the written note.
    expect(toWritten('Bb3', 'clarinet')).toBe('C4');
    // Adler: the Eb alto saxophone sounds a major 6th below the written note.
    expect(toWritten('Bb3', 'alto-sax')).toBe('G4');
    // Adler: the glockenspiel sounds two octaves above the written note.
    expect(toWritten('C7', 'glockenspiel')).toBe('C5');
  });

  it('should return the concert note when written and sounded back on any instrument', () => {
    fc.assert(
      fc.property(singleAccidentalNote, fc.constantFrom(...ids), (note, id) => {
        expect(toConcert(toWritten(note, id), id)).toBe(note);
      }),
    );
  });

  it('should move by the instrument semitone offset when any note is written', () => {
    fc.assert(
      fc.property(singleAccidentalNote, fc.constantFrom(...ids), (note, id) => {
        // Sounding = written + the instrument's offset in semitones (Adler's intervals, checked in
        // instruments.spec), so concert − written is that offset.
        expect(midi(note) - midi(toWritten(note, id))).toBe(transpositionSize(id).semitones);
      }),
    );
  });

  it('should agree with tonal when a concert note is written for any instrument', () => {
    fc.assert(
      fc.property(singleAccidentalNote, fc.constantFrom(...ids), (note, id) => {
        // tonal (npm) Note.transpose by the inverted handbook interval.
        expect(toWritten(note, id)).toBe(Note.transpose(note, invert(id)));
      }),
    );
  });
});

/** The written-to-sounding interval reversed; instruments.spec checks the data against Adler. */
function invert(id: string): string {
  const interval = instruments.find((instrument) => instrument.id === id)!.transposition;
  if (interval === '1P') return '1P';
  return interval.startsWith('-') ? interval.slice(1) : `-${interval}`;
}
