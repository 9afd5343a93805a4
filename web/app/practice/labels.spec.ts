import { describe, expect, it } from 'vitest';
import { keyWords, withAccidentalSigns } from './labels';

describe('withAccidentalSigns', () => {
  it('should write flats and sharps as signs when a caption names keys and notes', () => {
    expect(withAccidentalSigns('Concert Eb major → written C major for Eb alto saxophone')).toBe(
      'Concert E♭ major → written C major for E♭ alto saxophone',
    );
    expect(withAccidentalSigns('fits (written Bb3–F#5)')).toBe('fits (written B♭3–F♯5)');
    expect(withAccidentalSigns('Gbb and C## (Bb)')).toBe('G♭♭ and C♯♯ (B♭)');
  });

  it('should leave words alone when a capital A to G starts them', () => {
    expect(withAccidentalSigns('Bass clef, Brass, Debussy, Ab.')).toBe(
      'Bass clef, Brass, Debussy, A♭.',
    );
  });
});

describe('keyWords', () => {
  it('should name the key with its sign when the tonic is flat', () => {
    expect(keyWords({ tonic: 'Eb', mode: 'major' })).toBe('E♭ major');
    expect(keyWords({ tonic: 'F#', mode: 'harmonic-minor' })).toBe('F♯ harmonic minor');
  });
});
