import { describe, expect, it } from 'vitest';
import { midi, schoolRange, toMusicXml } from '@shared/music';
import { buildSheet, type ReadySheet } from './sheet';
import { defaultSheetRequest, type SheetRequest } from './sheet-request';

const ready = (request: Partial<SheetRequest>) =>
  buildSheet({ ...defaultSheetRequest, ...request }) as ReadySheet;

describe('buildSheet', () => {
  it('should time and play the cycle as one line with its last tonic held', () => {
    const broad = ready({ instrument: 'clarinet', tempo: 100 });
    // Common practice, no source: 24 beats and a held whole note, 28 beats: 16.8 s at 100.
    expect(broad.concertNotes).toHaveLength(21);
    expect(broad.durationText).toBe('about 17 s at ♩ = 100');
    const brisk = ready({ instrument: 'clarinet', tempo: 100, pattern: 'cycle-brisk' });
    // 12 beats and a held whole note, 16 beats: 9.6 s at 100.
    expect(brisk.durationText).toBe('about 10 s at ♩ = 100');
  });

  it('should show and export the same concert clef when a transposing part is at concert pitch', () => {
    for (const instrument of ['bari-sax', 'tenor-sax', 'piccolo', 'double-bass']) {
      const sheet = ready({ instrument, pitch: 'concert' });
      const xml = toMusicXml({
        title: 'x',
        instrumentId: instrument,
        key: sheet.concertKey,
        notes: sheet.staff.notes,
        pitch: 'concert',
        tempo: 100,
        articulation: 'tongued',
      });
      const sign = { treble: 'G', bass: 'F', alto: 'C' }[sheet.staff.clef];
      // MusicXML 4.0: the clef's sign, and <clef-octave-change> for an octave clef.
      expect(xml, instrument).toContain(`<clef><sign>${sign}</sign>`);
      const octave = sheet.staff.clefs[0].octaveChange;
      expect(xml.includes('<clef-octave-change>'), instrument).toBe(octave !== 0);
    }
    // Adler, The Study of Orchestration: the baritone saxophone's concert part lies in bass clef.
    expect(ready({ instrument: 'bari-sax', pitch: 'concert' }).staff.clef).toBe('bass');
    // Adler: the piccolo sounds an octave above its written notes, marked 8va on the clef.
    const piccolo = ready({ instrument: 'piccolo', pitch: 'concert' });
    expect(piccolo.staff.clefs[0]).toEqual({ clef: 'treble', octaveChange: 1 });
    expect(piccolo.caption).toContain('treble clef 8va (sounds an octave higher)');
  });

  it('should tell each school level whether the requirement fits', () => {
    const sheet = ready({ instrument: 'piccolo', tonic: 'C', octaves: 2 });
    expect(sheet.levels.map(({ level }) => level)).toEqual(['elementary', 'middle', 'high']);
    expect(sheet.levels.every(({ fits }) => !fits)).toBe(true);
  });

  it('should place the pattern inside the player’s school range when a level is chosen', () => {
    const full = ready({ instrument: 'trumpet', tonic: 'Bb', octaves: 1 });
    const young = ready({ instrument: 'trumpet', tonic: 'Bb', octaves: 1, level: 'elementary' });
    expect(young.kind).toBe('ready');
    const range = schoolRange('trumpet', 'elementary');
    for (const { note } of young.staff.notes) {
      expect(midi(note)).toBeGreaterThanOrEqual(midi(range.lowest));
      expect(midi(note)).toBeLessThanOrEqual(midi(range.highest));
    }
    // The same notes as the full-range sheet, or an octave moved into the level's range.
    expect(young.staff.notes).toHaveLength(full.staff.notes.length);
  });

  it('should say a requirement cannot fit a level when no placement lies in its range', () => {
    // Two octaves of concert C for piccolo reach written C7 (common practice, no source), above
    // the middle-school piccolo range.
    const sheet = buildSheet({
      ...defaultSheetRequest,
      instrument: 'piccolo',
      tonic: 'C',
      octaves: 2,
      level: 'middle',
    });
    expect(sheet.kind).toBe('out-of-range');
    expect(sheet.kind === 'out-of-range' && sheet.message).toMatch(/^Cannot fit this level: .*C7/);
    expect(
      buildSheet({ ...defaultSheetRequest, instrument: 'piccolo', tonic: 'C', octaves: 2 }).kind,
    ).toBe('ready');
  });
});
