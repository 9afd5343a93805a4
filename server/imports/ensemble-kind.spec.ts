import { describe, expect, it } from 'vitest';
import { guessEnsembleKind } from './ensemble-kind';

describe('guessEnsembleKind', () => {
  it.each([
    ['Jazz Band', 'jazz-band'],
    ['Jazz Ensemble II', 'jazz-band'],
    ['Chamber Orchestra', 'string-orchestra'],
    ['Strings 7', 'string-orchestra'],
    ['Beginning Band', 'beginning-band'],
    ['Beginning Band - Clarinet', 'beginning-band'],
    ['Symphonic Band', 'symphonic-band'],
    ['Wind Symphony', 'symphonic-band'],
    ['Marching Band', 'marching-band'],
    ['Percussion Ensemble', 'percussion-ensemble'],
    ['Concert Band', 'concert-band'],
    ['Sixth Grade Band', 'concert-band'],
    ['Woodwind Choir', 'concert-band'],
  ])('should call %s a %s when guessing from the name', (name, kind) => {
    expect(guessEnsembleKind(name)).toBe(kind);
  });
});
