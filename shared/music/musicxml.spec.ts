// @ts-expect-error jsdom ships no type declarations and @types/jsdom is not installed.
import { JSDOM } from 'jsdom';
import { describe, expect, it } from 'vitest';
import type { Key } from './keys';
import { toMusicXml, type MusicXmlOptions } from './musicxml';
import { pattern, type PatternNote } from './patterns';

const concertBb: Key = { tonic: 'Bb', mode: 'major' };

function sheet(overrides: Partial<MusicXmlOptions> = {}): Document {
  const instrumentId = overrides.instrumentId ?? 'clarinet';
  const pitch = overrides.pitch ?? 'written';
  const key = overrides.key ?? concertBb;
  const articulation = overrides.articulation ?? 'slurred';
  const notes =
    overrides.notes ??
    pattern('cycle-broad', key, { instrument: instrumentId, pitch, articulation });
  const xml = toMusicXml({
    title: 'Concert Bb & scale',
    instrumentId,
    key,
    notes,
    pitch,
    tempo: 96,
    articulation,
    ...overrides,
  });
  return new JSDOM(xml, { contentType: 'text/xml' }).window.document;
}

const text = (element: Element | null | undefined) => element?.textContent ?? null;
const childNames = (element: Element) => Array.from(element.children).map(({ tagName }) => tagName);

describe('toMusicXml', () => {
  it('should produce a MusicXML 4.0 partwise document when given a pattern', () => {
    const document = sheet();
    expect(document.getElementsByTagName('parsererror')).toHaveLength(0);
    // MusicXML 4.0 (W3C Music Notation Community Group): the root of a partwise score.
    expect(document.documentElement.tagName).toBe('score-partwise');
    expect(document.documentElement.getAttribute('version')).toBe('4.0');
    expect(text(document.querySelector('work-title'))).toBe('Concert Bb & scale');
    expect(text(document.querySelector('score-part part-name'))).toBe('Clarinet');
    expect(document.querySelector('score-part')?.getAttribute('id')).toBe(
      document.querySelector('part')?.getAttribute('id'),
    );
  });

  it('should order the attributes as the schema does when the sheet is written for the clarinet', () => {
    const attributes = sheet().querySelector('measure attributes') as Element;
    // MusicXML 4.0 musicxml.xsd: divisions, key, time, clef, transpose in that order.
    expect(childNames(attributes)).toEqual(['divisions', 'key', 'time', 'clef', 'transpose']);
    // MusicXML 4.0 musicxml.xsd: <transpose> holds <diatonic> then <chromatic>; Bb clarinet −1, −2.
    expect(childNames(attributes.querySelector('transpose') as Element)).toEqual([
      'diatonic',
      'chromatic',
    ]);
    expect(text(attributes.querySelector('transpose diatonic'))).toBe('-1');
    expect(text(attributes.querySelector('transpose chromatic'))).toBe('-2');
    // Common practice, no source: concert Bb major is C major (no sharps or flats) for the clarinet.
    expect(text(attributes.querySelector('key fifths'))).toBe('0');
    expect(text(attributes.querySelector('key mode'))).toBe('major');
    expect([
      text(attributes.querySelector('time beats')),
      text(attributes.querySelector('time beat-type')),
    ]).toEqual(['4', '4']);
    // MusicXML 4.0 tutorial: the treble clef is sign G on line 2.
    expect([
      text(attributes.querySelector('clef sign')),
      text(attributes.querySelector('clef line')),
    ]).toEqual(['G', '2']);
  });

  it('should carry whole octaves in octave-change when the instrument transposes by octaves', () => {
    const cases: [string, string[]][] = [
      // Adler, The Study of Orchestration: sounds an octave higher; MusicXML 4.0 <octave-change>.
      ['piccolo', ['0', '0', '1']],
      // Adler: sounds two octaves higher.
      ['glockenspiel', ['0', '0', '2']],
      // Adler: sounds an octave lower.
      ['double-bass', ['0', '0', '-1']],
      // Adler: sounds a major 9th lower: MusicXML diatonic −1, chromatic −2, octave-change −1.
      ['tenor-sax', ['-1', '-2', '-1']],
      // Adler: sounds a major 6th lower.
      ['alto-sax', ['-5', '-9']],
      // Adler: horn in F sounds a perfect 5th lower.
      ['horn', ['-4', '-7']],
    ];
    for (const [instrumentId, values] of cases) {
      const transpose = sheet({ instrumentId }).querySelector('transpose') as Element;
      expect(
        Array.from(transpose.children).map((child) => child.textContent),
        instrumentId,
      ).toEqual(values);
    }
  });

  it('should leave transpose out when the sheet is in concert pitch or the instrument sounds as written', () => {
    expect(sheet({ pitch: 'concert' }).querySelector('transpose')).toBeNull();
    expect(sheet({ instrumentId: 'flute' }).querySelector('transpose')).toBeNull();
    // Kostka & Payne, Tonal Harmony: Bb major has two flats.
    expect(text(sheet({ pitch: 'concert' }).querySelector('key fifths'))).toBe('-2');
  });

  it('should take the key of the written part when the sheet is written for a saxophone', () => {
    // Common practice, no source: concert Bb is G major (one sharp) for Eb instruments.
    expect(text(sheet({ instrumentId: 'alto-sax' }).querySelector('key fifths'))).toBe('1');
    // Common practice, no source: concert B major is written Db major (five flats) for Bb instruments.
    expect(text(sheet({ key: { tonic: 'B', mode: 'major' } }).querySelector('key fifths'))).toBe(
      '-5',
    );
    expect(
      text(sheet({ key: { tonic: 'G', mode: 'harmonic-minor' } }).querySelector('key mode')),
    ).toBe('minor');
  });

  it('should use the bass and alto clefs when the instrument reads them', () => {
    const clef = (instrumentId: string) => {
      const document = sheet({ instrumentId });
      return [text(document.querySelector('clef sign')), text(document.querySelector('clef line'))];
    };
    // MusicXML 4.0 tutorial: bass clef F on line 4, alto clef C on line 3.
    expect(clef('tuba')).toEqual(['F', '4']);
    expect(clef('viola')).toEqual(['C', '3']);
  });

  it('should give the tempo as a metronome mark and sound tempo when the sheet has a tempo', () => {
    const document = sheet();
    expect(text(document.querySelector('metronome per-minute'))).toBe('96');
    expect(document.querySelector('sound')?.getAttribute('tempo')).toBe('96');
  });

  it('should write each note with duration before type and split measures at four beats', () => {
    const notes = pattern('cycle-broad', concertBb, { instrument: 'clarinet', pitch: 'written' });
    const document = sheet({ notes });
    const divisions = Number(text(document.querySelector('divisions')));
    const measures = Array.from(document.querySelectorAll('measure'));
    expect(measures).toHaveLength(7);
    for (const measure of measures) {
      const durations = Array.from(measure.querySelectorAll('note duration')).map((element) =>
        Number(element.textContent),
      );
      expect(durations.reduce((total, value) => total + value, 0)).toBe(4 * divisions);
    }
    const written = Array.from(document.querySelectorAll('note')).map((note) => {
      const names = childNames(note);
      // MusicXML 4.0 musicxml.xsd: <duration> comes before <type>.
      expect(names.indexOf('duration')).toBeLessThan(names.indexOf('type'));
      const step = text(note.querySelector('step'));
      const alter = Number(text(note.querySelector('alter')) ?? 0);
      return `${step}${alter === 1 ? '#' : alter === -1 ? 'b' : ''}${text(note.querySelector('octave'))}`;
    });
    expect(written).toEqual(notes.map(({ note }) => note));
    expect(text(document.querySelector('note type'))).toBe('half');
  });

  it('should mark slurs with start and stop when the articulation is slurred', () => {
    const notes = pattern('long-tones', concertBb, {
      instrument: 'clarinet',
      pitch: 'written',
      articulation: 'slurred',
    });
    const document = sheet({ notes });
    const slurs = Array.from(document.querySelectorAll('note')).map((note) => {
      const slur = note.querySelector('notations slur');
      return slur ? `${slur.getAttribute('type')}${slur.getAttribute('number')}` : '';
    });
    // MusicXML 4.0: <slur type="start|stop" number="1"/> under <notations>. Common practice,
    // no source: a slur starts on a tongued note, so the rising slur ends on the 7th (notes 1–7)
    // and the top note starts the falling slur, which runs whole down to the tonic (8–15).
    expect(slurs).toEqual([
      'start1',
      ...Array(5).fill(''),
      'stop1',
      'start1',
      ...Array(6).fill(''),
      'stop1',
    ]);
  });

  it('should tie a note across the bar line and fill the last measure with rests', () => {
    const notes: PatternNote[] = [
      { note: 'C4', beats: 1, slurred: false },
      { note: 'D4', beats: 4, slurred: false },
    ];
    const document = sheet({ notes, instrumentId: 'flute', pitch: 'concert' });
    const measures = Array.from(document.querySelectorAll('measure'));
    expect(measures).toHaveLength(2);
    const second = measures[0].querySelectorAll('note')[1];
    expect(text(second.querySelector('type'))).toBe('half');
    expect(second.querySelector('dot')).not.toBeNull();
    expect(second.querySelector('tie')?.getAttribute('type')).toBe('start');
    expect(second.querySelector('notations tied')?.getAttribute('type')).toBe('start');
    const continued = measures[1].querySelectorAll('note')[0];
    expect(continued.querySelector('tie')?.getAttribute('type')).toBe('stop');
    expect(text(continued.querySelector('type'))).toBe('quarter');
    const rest = measures[1].querySelectorAll('note')[1];
    expect(rest.querySelector('rest')).not.toBeNull();
    expect(text(rest.querySelector('type'))).toBe('half');
    expect(rest.querySelector('dot')).not.toBeNull();
  });

  it('should show an accidental only where the key signature does not give it', () => {
    const notes: PatternNote[] = ['F#4', 'F4', 'F4', 'Bb4'].map((note) => ({
      note,
      beats: 1,
      slurred: false,
    }));
    const document = sheet({
      notes,
      instrumentId: 'flute',
      pitch: 'concert',
      key: { tonic: 'G', mode: 'major' },
    });
    const accidentals = Array.from(document.querySelectorAll('note')).map((note) =>
      text(note.querySelector('accidental')),
    );
    // Common practice, no source: an accidental lasts to the end of its measure.
    expect(accidentals).toEqual([null, 'natural', null, 'flat']);
  });

  it('should throw when the instrument is unknown', () => {
    expect(() => sheet({ instrumentId: 'kazoo', notes: [] })).toThrow(/Unknown instrument/);
  });
});
