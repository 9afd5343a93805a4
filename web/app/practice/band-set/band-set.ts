import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { instruments, type InstrumentFamily } from '@shared/music';
import { instrumentInText } from '../instrument-label';
import { articulationLabels, clefLabels, keyWords, patternLabels } from '../labels';
import { buildSheet, type Sheet } from '../sheet';
import type { SheetRequest } from '../sheet-request';
import { Staff } from '../staff/staff';

/** Which players a set is printed for. */
export type Ensemble = 'band' | 'orchestra';

/** The sections of each ensemble: a concert band's winds and mallets, a string orchestra. */
export const ensembleFamilies: Record<Ensemble, InstrumentFamily[]> = {
  band: ['woodwind', 'brass', 'percussion'],
  orchestra: ['strings'],
};

/**
 * One requirement for every instrument of a band or a string orchestra, one compact staff
 * each in the player's written key, laid out to print and hand out.
 */
@Component({
  selector: 'tb-band-set',
  imports: [Staff],
  templateUrl: './band-set.html',
  styleUrl: './band-set.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BandSet {
  /** The requirement; its instrument and pitch are replaced by each part's own. */
  readonly request = input.required<SheetRequest>();
  readonly ensemble = input<Ensemble>('band');

  protected readonly clefLabels = clefLabels;

  protected readonly heading = computed(() => {
    const request = this.request();
    return `Concert ${keyWords({ tonic: request.tonic, mode: request.mode })}`;
  });

  protected readonly details = computed(() => {
    const request = this.request();
    return [
      patternLabels[request.pattern],
      `♩ = ${request.tempo}`,
      articulationLabels[request.articulation],
      request.octaves === 2 ? 'two octaves' : 'one octave',
    ].join(' · ');
  });

  protected readonly parts = computed(() => {
    const request = this.request();
    const families = ensembleFamilies[this.ensemble()];
    return instruments
      .filter((instrument) => families.includes(instrument.family))
      .map((instrument) => ({
        name: capitalised(instrumentInText(instrument.id)),
        sheet: buildSheet({ ...request, instrument: instrument.id, pitch: 'written' }) as Sheet,
      }));
  });

  protected keyName = keyWords;
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
