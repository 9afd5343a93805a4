import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom, type Observable } from 'rxjs';
import type { Ladder, LadderRequirement, LadderRung } from '@shared/api/ladder';
import { isConflict } from '../../core/forms/record-form';
import { errorMessage, fieldErrorsOf } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { RecordPage } from '../../core/record-page/record-page';
import { createWrite } from '../../core/state/write';
import { BenchmarkEditor } from '../benchmark-editor/benchmark-editor';
import { askToConfirm, type ConfirmDialogData } from '../../core/confirm-dialog/confirm-dialog';
import { injectPutInForce } from '../impact-dialog/impact-dialog';
import { LadderData } from '../ladder-data';
import { RungEditor, type RequirementEdit } from '../rung-editor/rung-editor';
import { reachWarnings } from '../reach-warnings';
import {
  benchmarkList,
  derivedCode,
  editorErrors,
  freeCode,
  newRequirement,
  renumbered,
  toModel,
  toPatch,
  tonicsForMode,
  type BenchmarkGrid,
  type DraftModel,
} from './draft-model';

/**
 * The coordinator's editor for a draft ladder version: rungs (added, removed, reordered,
 * retitled), their requirements and the benchmarks; saved as a whole, then published.
 */
@Component({
  selector: 'tb-ladder-editor',
  imports: [
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    RouterLink,
    PageState,
    RecordPage,
    ConflictNotice,
    RungEditor,
    BenchmarkEditor,
  ],
  templateUrl: './ladder-editor.html',
  styleUrl: './ladder-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LadderEditor {
  private readonly ladderData = inject(LadderData);
  private readonly dialog = inject(MatDialog);
  private readonly putInForce = injectPutInForce();
  private readonly router = inject(Router);

  /** The route's `:id`: the draft's version id. */
  readonly id = input.required<string>();

  /** The version as read from the API; the editor works on `draft` and `model`. */
  protected readonly version = this.ladderData.version(() => Number(this.id()));
  private readonly inForce = this.ladderData.inForce();
  /** Why the draft cannot be edited (it failed to load, or is published), or ''. */
  protected readonly failure = computed(() => {
    const error = this.version.error();
    if (error) return errorMessage(error, 'The draft could not be loaded.');
    return this.version.hasValue() && this.version.value().status !== 'draft'
      ? 'This version is published; published versions do not change. Start a new draft from the ladder page.'
      : '';
  });
  protected readonly draft = signal<Ladder | null>(null);
  protected readonly activeName = computed(() =>
    this.inForce.hasValue() ? this.inForce.value().name : null,
  );
  private readonly deleteWrite = createWrite();
  protected readonly model = signal<DraftModel | null>(null);
  protected readonly dirty = signal(false);
  protected readonly busy = signal<'saving' | 'publishing' | 'deleting' | null>(null);
  protected readonly errors = signal<ReadonlyMap<string, string>>(new Map());
  protected readonly problem = signal('');
  protected readonly conflict = signal(false);
  protected readonly savedAt = signal<Date | null>(null);
  /** Requirements a section cannot play at the grades expected to reach their rung. */
  protected readonly reachWarnings = computed(() => {
    const model = this.model();
    return model ? reachWarnings(model.rungs, benchmarkList(model.benchmarks).benchmarks) : [];
  });
  protected readonly requirementCount = computed(() =>
    (this.model()?.rungs ?? []).reduce((sum, rung) => sum + rung.requirements.length, 0),
  );

  constructor() {
    effect(() => {
      if (!this.version.hasValue()) return;
      const ladder = this.version.value();
      if (ladder.status === 'draft') untracked(() => this.show(ladder));
    });
  }

  protected fetch(): void {
    this.conflict.set(false);
    this.version.reload();
  }

  protected setName(event: Event): void {
    const name = (event.target as HTMLInputElement).value;
    this.change((model) => ({ ...model, name }));
  }

  protected setTitle(rungIndex: number, title: string): void {
    this.changeRung(rungIndex, (rung) => ({ ...rung, title }));
  }

  protected editRequirement(rungIndex: number, { index, patch }: RequirementEdit): void {
    this.change((model) => {
      const rung = model.rungs[rungIndex]!;
      const before = rung.requirements[index]!;
      const after: LadderRequirement = { ...before, ...patch };
      if (patch.mode && after.tonic && !tonicsForMode(after.mode).includes(after.tonic)) {
        after.tonic = tonicsForMode(after.mode).includes('C') ? 'C' : tonicsForMode(after.mode)[0]!;
      }
      // A code that was only ever derived from the key follows the key; a code typed by hand stays.
      const derivedBefore = derivedCode(rung.number, before);
      if (
        (patch.tonic || patch.mode) &&
        after.tonic &&
        (before.code === '' || before.code.startsWith(derivedBefore))
      ) {
        const suffix = before.code === '' ? '' : before.code.slice(derivedBefore.length);
        after.code = freeCode(model, derivedCode(rung.number, after) + suffix, before);
      }
      const requirements = rung.requirements.map((requirement, at) =>
        at === index ? after : requirement,
      );
      return {
        ...model,
        rungs: model.rungs.map((each, at) => (at === rungIndex ? { ...each, requirements } : each)),
      };
    });
  }

  protected addRequirement(rungIndex: number): void {
    this.change((model) => {
      const requirement = newRequirement();
      return {
        ...model,
        rungs: model.rungs.map((rung, at) =>
          at === rungIndex ? { ...rung, requirements: [...rung.requirements, requirement] } : rung,
        ),
      };
    });
  }

  protected removeRequirement(rungIndex: number, index: number): void {
    this.changeRung(rungIndex, (rung) => ({
      ...rung,
      requirements: rung.requirements.filter((_requirement, at) => at !== index),
    }));
  }

  protected moveRung(rungIndex: number, delta: -1 | 1): void {
    this.change((model) => {
      const rungs = [...model.rungs];
      const target = rungIndex + delta;
      if (target < 0 || target >= rungs.length) return model;
      [rungs[rungIndex], rungs[target]] = [rungs[target]!, rungs[rungIndex]!];
      return { ...model, rungs: renumbered(rungs) };
    });
  }

  protected removeRung(rungIndex: number): void {
    this.change((model) => ({
      ...model,
      rungs: renumbered(model.rungs.filter((_rung, at) => at !== rungIndex)),
    }));
  }

  protected addRung(): void {
    this.change((model) => ({
      ...model,
      rungs: [
        ...model.rungs,
        {
          number: model.rungs.length + 1,
          title: `Rung ${model.rungs.length + 1}`,
          requirements: [],
        },
      ],
    }));
  }

  protected setBenchmarks(grid: BenchmarkGrid): void {
    this.change((model) => ({ ...model, benchmarks: grid }));
  }

  protected save(): void {
    void this.saved();
  }

  protected async publish(): Promise<void> {
    if (this.dirty() && !(await this.saved())) return;
    const draft = this.draft();
    if (!draft) return;
    const data = { versionId: draft.id, mode: 'publish' as const, name: draft.name };
    if (await this.putInForce(data)) void this.router.navigate(['/ladder']);
  }

  protected async discard(): Promise<void> {
    const draft = this.draft();
    if (!draft) return;
    const confirmed = await this.confirm({
      title: `Delete the draft “${draft.name}”?`,
      paragraphs: [
        'The ladder in force does not change. The draft and every change in it are thrown away.',
      ],
      confirm: 'Delete the draft',
      destructive: true,
    });
    if (!confirmed) return;
    this.busy.set('deleting');
    this.deleteWrite.send(this.ladderData.deleteDraft(draft.id), {
      next: () => void this.router.navigate(['/ladder']),
      error: (error: unknown) => {
        this.busy.set(null);
        this.problem.set(errorMessage(error, 'The draft could not be deleted.'));
      },
    });
  }

  /** Saves the model; answers whether it was saved. */
  private saved(): Promise<boolean> {
    const draft = this.draft();
    const model = this.model();
    if (!draft || !model || this.busy()) return Promise.resolve(false);
    this.busy.set('saving');
    this.problem.set('');
    return this.attempt(
      this.ladderData.updateDraft(draft.id, toPatch(model, draft.version)),
      model,
    );
  }

  private async attempt(request: Observable<Ladder>, model: DraftModel): Promise<boolean> {
    try {
      const ladder = await firstValueFrom(request);
      this.show(ladder);
      this.savedAt.set(new Date());
      return true;
    } catch (error: unknown) {
      if (isConflict(error)) {
        this.conflict.set(true);
        return false;
      }
      const fieldErrors = fieldErrorsOf(error);
      this.errors.set(editorErrors(fieldErrors, model));
      this.problem.set(
        fieldErrors.length
          ? `The draft was not saved: ${fieldErrors.length === 1 ? 'one field needs' : `${fieldErrors.length} fields need`} a change, marked ⚠ below.`
          : errorMessage(error, 'The draft could not be saved.'),
      );
      return false;
    } finally {
      this.busy.set(null);
    }
  }

  private confirm(data: ConfirmDialogData): Promise<boolean> {
    return askToConfirm(this.dialog, data, '560px');
  }

  private change(update: (model: DraftModel) => DraftModel): void {
    const model = this.model();
    if (!model) return;
    this.model.set(update(model));
    this.dirty.set(true);
    this.savedAt.set(null);
  }

  private changeRung(rungIndex: number, update: (rung: LadderRung) => LadderRung): void {
    this.change((model) => ({
      ...model,
      rungs: model.rungs.map((rung, at) => (at === rungIndex ? update(rung) : rung)),
    }));
  }

  private show(ladder: Ladder): void {
    this.draft.set(ladder);
    this.model.set(toModel(ladder));
    this.dirty.set(false);
    this.errors.set(new Map());
    this.problem.set('');
    this.conflict.set(false);
  }
}
