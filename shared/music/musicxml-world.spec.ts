// @ts-expect-error jsdom ships no type declarations and @types/jsdom is not installed.
import { JSDOM } from 'jsdom';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
// @ts-expect-error verovio ships no type declarations; the few calls used are typed below.
import createVerovioModule from 'verovio/wasm';
// @ts-expect-error as above.
import { VerovioToolkit } from 'verovio/esm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sheetClefs } from './clefs';
import { instruments } from './instrument-data';
import type { Key } from './keys';
import { divisionsFor, layOutMeasures } from './measure-layout';
import { toMusicXml } from './musicxml';
import { patternIds } from './pattern-shapes';
import {
  articulations,
  pattern,
  PatternRangeError,
  type PatternNote,
  type PatternPitch,
} from './patterns';
import { midi, parseNote } from './pitch';

const schemaFolder = resolve(__dirname, '../../tests/fixtures/musicxml-4.0');
const keys: Key[] = [
  { tonic: 'B', mode: 'major' },
  { tonic: 'E', mode: 'melodic-minor' },
  { tonic: 'C', mode: 'chromatic' },
];

interface Variant {
  name: string;
  instrumentId: string;
  pitch: PatternPitch;
  notes: PatternNote[];
  xml: string;
}

/** Every instrument × pattern × pitch × octave count × articulation in three keys. */
function everyVariant(): Variant[] {
  const variants: Variant[] = [];
  for (const { id: instrumentId } of instruments) {
    for (const key of keys) {
      for (const id of patternIds) {
        for (const pitch of ['concert', 'written'] as const) {
          for (const octaves of [1, 2] as const) {
            for (const articulation of articulations) {
              let notes: PatternNote[];
              try {
                notes = pattern(id, key, {
                  instrument: instrumentId,
                  pitch,
                  octaves,
                  articulation,
                });
              } catch (error) {
                if (error instanceof PatternRangeError) continue;
                throw error;
              }
              const name = `${instrumentId}-${key.tonic}-${key.mode}-${id}-${pitch}-${octaves}-${articulation}`;
              const xml = toMusicXml({
                title: name,
                instrumentId,
                key,
                notes,
                pitch,
                tempo: 72,
                articulation,
              });
              variants.push({ name, instrumentId, pitch, notes, xml });
            }
          }
        }
      }
    }
  }
  return variants;
}

/** The part of verovio's toolkit the checks use (verovio.org, JavaScript toolkit). */
interface Toolkit {
  setOptions(options: Record<string, unknown>): void;
  loadData(data: string): boolean;
  getMEI(): string;
  renderToTimemap(options: Record<string, unknown>): { on?: string[] }[];
  getMIDIValuesForElement(id: string): { pitch: number };
}

const variants = everyVariant();
const parse = (xml: string): Document =>
  new JSDOM(xml, { contentType: 'text/xml' }).window.document;
const clefsIn = (document: Document) =>
  Array.from(document.querySelectorAll('clef')).map((clef) => ({
    sign: clef.querySelector('sign')?.textContent,
    line: clef.querySelector('line')?.textContent,
    octave: Number(clef.querySelector('clef-octave-change')?.textContent ?? 0),
  }));
const concertSheet = (instrumentId: string, key: Key, octaves: 1 | 2 = 1) => {
  const notes = pattern('cycle-broad', key, { instrument: instrumentId, octaves });
  return {
    notes,
    document: parse(
      toMusicXml({
        title: 'concert',
        instrumentId,
        key,
        notes,
        pitch: 'concert',
        tempo: 60,
        articulation: 'tongued',
      }),
    ),
  };
};

describe('exported MusicXML checked against the world', () => {
  let folder: string;
  beforeAll(() => {
    folder = mkdtempSync(join(tmpdir(), 'tutti-musicxml-'));
  });
  afterAll(() => rmSync(folder, { recursive: true, force: true }), 60_000);

  it('should validate against the MusicXML 4.0 XSD when every variant is exported', () => {
    const files = variants.map(({ name, xml }) => {
      const file = join(folder, `${name}.musicxml`);
      writeFileSync(file, xml);
      return file;
    });
    expect(files.length).toBeGreaterThan(1000);
    // MusicXML 4.0 musicxml.xsd (W3C Music Notation Community Group), checked by libxml2's
    // xmllint; the catalog maps the schema's imports to the local copies.
    const result = execFileSync(
      'xmllint',
      ['--noout', '--nonet', '--schema', join(schemaFolder, 'musicxml.xsd'), ...files],
      {
        env: { ...process.env, XML_CATALOG_FILES: join(schemaFolder, 'catalog.xml') },
        encoding: 'utf8',
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    expect(result).toBe('');
  }, 60_000);

  it('should load in verovio with the same pitches and durations when exported', async () => {
    const module = await createVerovioModule();
    const toolkit = new VerovioToolkit(module) as Toolkit;
    toolkit.setOptions({ inputFrom: 'musicxml' });
    // Both pitches for every instrument, one cycle and one of the three keys in turn.
    const sample = variants.filter(
      ({ name, instrumentId }) =>
        name.endsWith('-slurred') &&
        name.includes(
          instruments.findIndex(({ id }) => id === instrumentId) % 2 === 0
            ? '-cycle-broad-'
            : '-cycle-brisk-',
        ) &&
        name.includes(`-${keys[instruments.findIndex(({ id }) => id === instrumentId) % 3].mode}-`),
    );
    expect(sample.length).toBeGreaterThan(40);
    const accidentals: Record<string, number> = { s: 1, f: -1, ss: 2, x: 2, ff: -2, n: 0 };
    for (const { name, notes, xml, pitch } of sample) {
      expect(toolkit.loadData(xml), name).toBeTruthy();
      // MEI notes: <note pname oct dur.ppq accid|accid.ges …/> or with an <accid> child.
      const read = Array.from(
        toolkit.getMEI().matchAll(/<note\b([^>]*?)(?:\/>|>([\s\S]*?)<\/note>)/g),
      ).map(([, attributes, inside = '']: RegExpExecArray) => {
        const attribute = (text: string, name: string) =>
          new RegExp(`\\s${name.replace('.', '\\.')}="([^"]*)"`).exec(text)?.[1];
        const accid =
          attribute(attributes, 'accid') ??
          attribute(attributes, 'accid.ges') ??
          attribute(inside, 'accid') ??
          attribute(inside, 'accid.ges');
        const alteration = accid ? accidentals[accid] : 0;
        return {
          step: `${attribute(attributes, 'pname')?.toUpperCase()}${attribute(attributes, 'oct')}:${alteration}`,
          ticks: Number(attribute(attributes, 'dur.ppq')),
        };
      });
      const divisions = divisionsFor(notes);
      const pieces = layOutMeasures(notes)
        .flat()
        .filter(({ note }) => note !== null);
      // Verovio (npm), an independent MusicXML reader: the same notes, pitches and lengths.
      expect(read, name).toEqual(
        pieces.map(({ note, beats }) => {
          const parsed = parseNote(note as string, true);
          return {
            step: `${parsed.letter}${parsed.octave}:${parsed.alteration}`,
            ticks: beats * divisions,
          };
        }),
      );
      if (pitch === 'concert') {
        // Verovio's MIDI: a concert sheet sounds its notes, octave clefs included.
        const timemap = toolkit.renderToTimemap({});
        const sounding = timemap.flatMap(({ on }) => on ?? []);
        const pitches = sounding.map((id) => toolkit.getMIDIValuesForElement(id).pitch);
        expect(pitches, name).toEqual(
          pieces.filter(({ tieStop }) => !tieStop).map(({ note }) => midi(note as string)),
        );
      }
    }
  }, 240_000);

  it('should write the concert clef the sheet shows when a saxophone part is at concert pitch', () => {
    // Adler, The Study of Orchestration: the baritone saxophone sounds an octave and a major 6th
    // below its written notes, so its concert part lies in the bass clef (sign F on line 4).
    for (const instrumentId of ['bari-sax', 'tenor-sax', 'bass-clarinet', 'euphonium-tc']) {
      const { document } = concertSheet(instrumentId, { tonic: 'Bb', mode: 'major' });
      expect(clefsIn(document)[0], instrumentId).toEqual({ sign: 'F', line: '4', octave: 0 });
    }
  }, 60_000);

  it('should carry the clef sheetClefs gives when any variant is exported', () => {
    const clefPattern =
      /<clef><sign>([GFC])<\/sign><line>\d<\/line>(?:<clef-octave-change>(-?\d)<\/clef-octave-change>)?<\/clef>/;
    const signs = { treble: 'G', bass: 'F', alto: 'C' };
    const wrong: string[] = [];
    for (const { name, instrumentId, notes, pitch, xml } of variants) {
      const expected = sheetClefs(instrumentId, notes, pitch);
      let current = '';
      xml
        .split('<measure number=')
        .slice(1)
        .forEach((measure, index) => {
          const change = clefPattern.exec(measure);
          if (change) current = `${change[1]}${Number(change[2] ?? 0)}`;
          const want = `${signs[expected[index].clef]}${expected[index].octaveChange}`;
          if (current !== want) wrong.push(`${name} measure ${index + 1}: ${current} not ${want}`);
        });
    }
    expect(wrong.slice(0, 5)).toEqual([]);
  }, 60_000);

  it('should keep the octave transposition on the clef when an octave instrument is at concert pitch', () => {
    // Adler, The Study of Orchestration (from memory): piccolo and xylophone sound an octave
    // above the written note, glockenspiel two, double bass one below; MusicXML 4.0
    // <clef-octave-change> marks the octave on the clef (an 8 or 15 above, an 8 below).
    const cases: [string, string, number][] = [
      ['piccolo', 'G', 1],
      ['xylophone', 'G', 1],
      ['glockenspiel', 'G', 2],
      ['double-bass', 'F', -1],
    ];
    for (const [instrumentId, sign, octave] of cases) {
      const { document, notes } = concertSheet(instrumentId, { tonic: 'F', mode: 'major' });
      expect(clefsIn(document)[0], instrumentId).toMatchObject({ sign, octave });
      // The <pitch> stays the sounding note: the first note is the concert tonic as it sounds.
      const first = document.querySelector('note pitch');
      expect(
        `${first?.querySelector('step')?.textContent}${first?.querySelector('octave')?.textContent}`,
      ).toBe(notes[0].note);
    }
  }, 60_000);

  it('should turn the marimba to bass clef for measures below G3 and keep treble elsewhere', () => {
    const notes = pattern(
      'cycle-broad',
      { tonic: 'F', mode: 'major' },
      {
        instrument: 'marimba',
        octaves: 2,
        pitch: 'written',
      },
    );
    const clefs = sheetClefs('marimba', notes, 'written');
    const measures = layOutMeasures(notes);
    expect(clefs.some(({ clef }) => clef === 'bass')).toBe(true);
    measures.forEach((pieces, index) => {
      const lowest = Math.min(
        ...pieces.filter(({ note }) => note).map(({ note }) => midi(note as string)),
      );
      // Common practice, no source: marimba parts read a grand staff's two clefs, so no treble
      // measure reaches below G3 (two ledger lines under the staff).
      expect(clefs[index].clef).toBe(lowest < midi('G3') ? 'bass' : 'treble');
    });
  });
});
