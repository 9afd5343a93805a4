import { describe, expect, it } from 'vitest';
import { practicePlan, type PracticeRequirement } from './practice-plan';

const requirement: PracticeRequirement = {
  key: { tonic: 'Bb', mode: 'major' },
  pattern: 'cycle-broad',
  tempo: 100,
  articulation: 'tongue-up-slur-down',
  octaves: 1,
};

describe('practicePlan', () => {
  it('should start with note names and long tones at 60 when the requirement is a cycle', () => {
    const steps = practicePlan(requirement);
    expect(steps.map(({ id }) => id).slice(0, 4)).toEqual([
      'note-names',
      'long-tones',
      'arpeggio',
      'slow-pattern',
    ]);
    expect(steps[0]).toMatchObject({ pattern: 'long-tones', tempo: 60, octaves: 1 });
    expect(steps[2]).toMatchObject({ pattern: 'arpeggio-long', tempo: 60 });
    expect(steps[3]).toMatchObject({
      pattern: 'cycle-broad',
      tempo: 60,
      articulation: 'tongue-up-slur-down',
    });
  });

  it('should climb through the usual tempos to the required tempo when the requirement is 100', () => {
    const steps = practicePlan(requirement);
    // Common practice, no source: metronome steps of 60, 80, 100, 120 to the quarter note.
    expect(steps.slice(3).map(({ tempo }) => tempo)).toEqual([60, 80, 100]);
    const last = steps[steps.length - 1];
    expect(last).toMatchObject({
      pattern: 'cycle-broad',
      tempo: 100,
      articulation: 'tongue-up-slur-down',
      octaves: 1,
    });
  });

  it('should bring the brisk rhythm in where its note speed matches the broad one when the requirement is brisk', () => {
    const steps = practicePlan({ ...requirement, pattern: 'cycle-brisk', tempo: 132, octaves: 2 });
    // Eighths at quarter = 66 move as fast as quarters at 132; then the usual marks again.
    expect(steps.map(({ tempo }) => tempo).slice(3)).toEqual([
      60, 80, 100, 120, 132, 66, 80, 100, 120, 132,
    ]);
    expect(steps.slice(3, 8).every(({ pattern }) => pattern === 'cycle-broad')).toBe(true);
    expect(steps.slice(8).every(({ pattern }) => pattern === 'cycle-brisk')).toBe(true);
    expect(steps[steps.length - 1]).toMatchObject({
      id: 'brisk',
      pattern: 'cycle-brisk',
      tempo: 132,
    });
    expect(steps.every(({ octaves }) => octaves === 2)).toBe(true);
  });

  it('should begin the climb at the start tempo when one is given', () => {
    const steps = practicePlan(requirement, { startTempo: 72 });
    expect(steps.slice(3).map(({ tempo }) => tempo)).toEqual([72, 80, 100]);
  });

  it('should keep the steps unique and the tempo rising when any requirement is planned', () => {
    for (const pattern of ['long-tones', 'arpeggio-long', 'cycle-broad', 'cycle-brisk'] as const) {
      for (const tempo of [50, 60, 88, 120, 160]) {
        const steps = practicePlan({ ...requirement, pattern, tempo });
        const ids = steps.map(({ id }) => id);
        expect(new Set(ids).size).toBe(ids.length);
        // The note speed (notes a minute: eighths count double) never drops along the climb.
        const climb = steps
          .slice(ids.indexOf('slow-pattern'))
          .map((step) => step.tempo * (step.pattern === 'cycle-brisk' ? 2 : 1));
        expect(climb).toEqual([...climb].sort((a, b) => a - b));
        expect(steps[steps.length - 1].title).toMatch(/^Pass-off/);
        expect(steps[steps.length - 1]).toMatchObject({
          pattern,
          tempo,
          articulation: requirement.articulation,
        });
        expect(
          steps.every(({ title, description }) => title.length > 0 && description.length > 20),
        ).toBe(true);
      }
    }
  });

  it('should name the written key and its notes when an instrument is given', () => {
    const [first] = practicePlan(requirement, { instrument: 'Alto Saxophone' });
    // Common practice, no source: concert Bb major is written G major for the Eb alto saxophone.
    expect(first.description).toContain('G major (your written key for concert Bb major)');
    expect(first.description).toContain('G A B C D E F# G');
    const violin = practicePlan(requirement, { instrument: 'violin' });
    expect(violin[3].description).toContain('bow');
  });

  it('should end on the pass-off at its own tempo when the requirement is slower than 60', () => {
    for (const pattern of ['long-tones', 'cycle-broad', 'cycle-brisk'] as const) {
      const steps = practicePlan({ ...requirement, pattern, tempo: 52 });
      const last = steps[steps.length - 1];
      expect(last).toMatchObject({ pattern, tempo: 52 });
      expect(last.title).toMatch(/^Pass-off/);
      expect(last.description).toMatch(/ask your director/);
    }
  });

  it('should tell each instrument how to hold a long tone', () => {
    const longTones = (instrument: string) =>
      practicePlan(requirement, { instrument }).find(({ id }) => id === 'long-tones')?.description;
    // Common practice, no source: winds sustain on the breath, strings on whole bows at a
    // steady contact point, mallet instruments cannot sustain and roll.
    expect(longTones('clarinet')).toMatch(/breath/);
    expect(longTones('viola')).toMatch(/whole bow/);
    expect(longTones('viola')).toMatch(/contact point/);
    expect(longTones('viola')).not.toMatch(/breath/);
    expect(longTones('marimba')).toMatch(/roll/);
    expect(longTones('marimba')).not.toMatch(/breath/);
  });

  it('should name the descending form when the scale comes down another way', () => {
    const [first] = practicePlan({ ...requirement, key: { tonic: 'E', mode: 'melodic-minor' } });
    // Kostka & Payne, Tonal Harmony: melodic minor rises with raised 6th and 7th and falls as
    // natural minor.
    expect(first.description).toContain('E F# G A B C# D# E');
    expect(first.description).toContain('E D C B A G F# E');
  });

  it('should throw when the instrument or the tempo is not usable', () => {
    expect(() => practicePlan(requirement, { instrument: 'kazoo' })).toThrow(/Unknown instrument/);
    expect(() => practicePlan({ ...requirement, tempo: 0 })).toThrow(/positive/);
  });
});
