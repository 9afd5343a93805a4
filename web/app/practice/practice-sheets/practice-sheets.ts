import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
} from '@angular/core';
import { Router } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { practicePlan, schoolLevelNames } from '@shared/music';
import { CurrentUser } from '../../core/auth/current-user';
import { CurrentDistrict } from '../../core/district/current-district';
import { PageState } from '../../core/state/page-state';
import { articulationLabels, keyWords, patternLabels } from '../labels';
import { BandSet, type Ensemble } from '../band-set/band-set';
import { downloadMusicXml } from '../musicxml-download';
import { SheetPlayback } from '../playback/sheet-playback';
import { PlanPanel } from '../practice-plan/plan-panel';
import { PlanPrint } from '../practice-plan/plan-print';
import { buildSheet, type ReadySheet } from '../sheet';
import { SheetForm } from '../sheet-form/sheet-form';
import { parseSheetRequest, tempoLimits, toSheetQuery, type SheetRequest } from '../sheet-request';
import { Staff } from '../staff/staff';
import { TakePanel } from '../take-panel/take-panel';

/** What the page shows below the form: the sheet, the band set or the printable plan. */
export type PracticeView = 'sheet' | 'band-set' | 'plan';

/**
 * Practice sheets: any scale for any instrument in written pitch, printable, downloadable as
 * MusicXML and playable at concert pitch. Every choice lives in the query string, so a link
 * such as /practice?tonic=Bb&mode=major&pattern=cycle-broad&tempo=100&instrument=clarinet
 * opens that sheet.
 */
@Component({
  selector: 'tb-practice-sheets',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    PageState,
    SheetForm,
    Staff,
    BandSet,
    PlanPanel,
    PlanPrint,
    TakePanel,
  ],
  templateUrl: './practice-sheets.html',
  styleUrl: './practice-sheets.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PracticeSheets {
  private readonly router = inject(Router);
  private readonly me = inject(CurrentUser).me;
  private readonly district = inject(CurrentDistrict).district;
  protected readonly playback = inject(SheetPlayback);
  /** 'Elementary school', 'Middle school', 'High school'. */
  protected readonly levelNames = Object.fromEntries(
    Object.entries(schoolLevelNames).map(([level, name]) => [
      level,
      name[0].toUpperCase() + name.slice(1),
    ]),
  );

  constructor() {
    inject(DestroyRef).onDestroy(() => this.playback.stop());
  }

  readonly tonic = input<string>();
  readonly mode = input<string>();
  readonly pattern = input<string>();
  readonly tempo = input<string>();
  readonly articulation = input<string>();
  readonly octaves = input<string>();
  readonly instrument = input<string>();
  readonly pitch = input<string>();
  /** The player's school level the pattern is placed for; the full range when absent. */
  readonly level = input<string>();
  /** 'band-set' or 'plan' for the print layouts; the sheet otherwise. */
  readonly view = input<string>();
  /** 'orchestra' for a string orchestra's set; a band's otherwise. */
  readonly ensemble = input<string>();
  /** The ladder requirement the sheet is for (its code), so a take of it can be sent. */
  readonly requirementCode = input<string>();
  /** The practice-plan step on the sheet, if any. */
  readonly step = input<string>();

  /** The requirement the form shows and the plan leads to. */
  protected readonly requirement = computed(() =>
    parseSheetRequest({
      tonic: this.tonic(),
      mode: this.mode(),
      pattern: this.pattern(),
      tempo: this.tempo(),
      articulation: this.articulation(),
      octaves: this.octaves(),
      instrument: this.instrument(),
      pitch: this.pitch(),
      level: this.level(),
    }),
  );
  protected readonly shownView = computed<PracticeView>(() => {
    const view = this.view();
    return view === 'band-set' || view === 'plan' ? view : 'sheet';
  });
  protected readonly shownEnsemble = computed<Ensemble>(() =>
    this.ensemble() === 'orchestra' ? 'orchestra' : 'band',
  );
  protected readonly plan = computed(() => {
    const requirement = this.requirement();
    return practicePlan(
      {
        key: { tonic: requirement.tonic, mode: requirement.mode },
        pattern: requirement.pattern,
        tempo: requirement.tempo,
        articulation: requirement.articulation,
        octaves: requirement.octaves,
      },
      { instrument: requirement.instrument },
    );
  });
  protected readonly shownStep = computed(() => {
    const id = this.step();
    const index = this.plan().findIndex((step) => step.id === id);
    return index < 0 ? undefined : { ...this.plan()[index], number: index + 1 };
  });
  /** The request on the sheet: the requirement, or the step of the plan being practised. */
  protected readonly shownRequest = computed<SheetRequest>(() => {
    const step = this.shownStep();
    const requirement = this.requirement();
    return step
      ? {
          ...requirement,
          pattern: step.pattern,
          tempo: step.tempo,
          articulation: step.articulation,
          octaves: step.octaves,
        }
      : requirement;
  });
  protected readonly sheet = computed(() => buildSheet(this.shownRequest()));

  /** The player's name on the printed sheet: a student's own; a line to write on otherwise. */
  protected readonly studentName = computed(() => {
    const me = this.me();
    return me?.role === 'student' ? me.name : '';
  });
  /** Today in the district's time zone, as the printed sheet dates it. */
  protected readonly today = computed(() =>
    new Intl.DateTimeFormat('en-US', {
      dateStyle: 'long',
      timeZone: this.district()?.timeZone,
    }).format(new Date()),
  );
  /** What the sheet asks, in one line: code, concert key, pattern, tempo, articulation, octaves. */
  protected readonly requirementLine = computed(() => {
    const request = this.shownRequest();
    const code = this.requirementCode();
    const step = this.shownStep();
    return [
      step ? `Step ${step.number} of ${this.plan().length}: ${step.title}` : '',
      code ? `Requirement ${code}` : 'Requirement',
      `concert ${keyWords({ tonic: request.tonic, mode: request.mode })}`,
      patternLabels[request.pattern],
      `♩ = ${request.tempo}`,
      articulationLabels[request.articulation],
      request.octaves === 2 ? 'two octaves' : 'one octave',
    ]
      .filter(Boolean)
      .join(' · ');
  });

  /** Opens another requirement from the form; a step being practised is left. */
  protected choose(request: SheetRequest): void {
    this.playback.stop();
    void this.go({ ...toSheetQuery(request), step: null });
  }

  protected tryOneOctave(): void {
    this.choose({ ...this.requirement(), octaves: 1 });
  }

  protected showStep(id: string | null): void {
    this.playback.stop();
    void this.go({ step: id, view: null });
  }

  protected showView(view: PracticeView): void {
    this.playback.stop();
    void this.go({ view: view === 'sheet' ? null : view });
  }

  protected chooseEnsemble(ensemble: Ensemble): void {
    void this.go({ ensemble: ensemble === 'band' ? null : ensemble });
  }

  protected download(sheet: ReadySheet): void {
    downloadMusicXml(sheet);
  }

  protected print(): void {
    window.print();
  }

  /**
   * A step of the thumb bar's tempo: 4 beats a minute (common practice, no source), within the
   * form's limits; the sheet shown (the requirement or a plan step) is opened at the new tempo.
   */
  protected stepTempo(sheet: ReadySheet, direction: 1 | -1): void {
    const tempo = Math.min(
      tempoLimits.fastest,
      Math.max(tempoLimits.slowest, sheet.request.tempo + 4 * direction),
    );
    if (tempo === sheet.request.tempo) return;
    this.playback.stop();
    // The router scrolls to the top after each navigation; a tap of the bar under the thumb keeps
    // the staff where the reader had it.
    const scrolled = window.scrollY;
    void this.go(
      this.shownStep() ? { tempo: String(tempo), step: null } : { tempo: String(tempo) },
    ).then(() => setTimeout(() => window.scrollTo({ top: scrolled })));
  }

  protected togglePlayback(sheet: ReadySheet): void {
    if (this.playback.playing()) {
      this.playback.stop();
    } else {
      void this.playback.play(sheet.concertNotes, sheet.request.tempo);
    }
  }

  private go(queryParams: Record<string, string | null>): Promise<boolean> {
    return this.router.navigate([], {
      queryParams,
      queryParamsHandling: 'merge',
      replaceUrl: true,
    });
  }
}
