import { describe, expect, it } from 'vitest';
import { toMusicXml } from '../../../shared/music';
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
});
