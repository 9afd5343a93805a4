import { describe, expect, it } from 'vitest';
import { drawingWidth, planSystems, staffWidth } from './staff-layout';
import { layOutMeasures } from '@shared/music/measure-layout';
import type { PatternNote } from '@shared/music/patterns';

describe('drawingWidth', () => {
  it('should draw at the box width on a phone and never wider than the widest staff', () => {
    expect(drawingWidth(366)).toBe(366);
    expect(drawingWidth(1400)).toBe(staffWidth);
    expect(drawingWidth(120)).toBe(300);
    expect(drawingWidth(0)).toBe(staffWidth);
  });
});

describe('planSystems', () => {
  it('should put fewer measures on each line when the staff is drawn narrower', () => {
    const notes: PatternNote[] = Array.from({ length: 32 }, (_, index) => ({
      note: index % 2 ? 'C5' : 'D5',
      beats: 1,
      slurred: false,
    }));
    const measures = layOutMeasures(notes);
    const wide = planSystems(measures, 0, false);
    const narrow = planSystems(measures, 0, false, 366);
    expect(narrow.systems.length).toBeGreaterThan(wide.systems.length);
    expect(narrow.systems.flat()).toEqual(wide.systems.flat());
  });
});
