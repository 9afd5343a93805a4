import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { forkJoin } from 'rxjs';
import type { ImportPreview } from '@shared/api/import';
import { schoolLevels, schoolListSchema, type School } from '@shared/api/school';
import { errorMessage } from '../../core/parse';
import { SchoolData } from '../../schools/school-data';
import { RosterImports } from '../roster-imports';
import { createWrite } from '../../core/state/write';

/** An org of a OneRoster bundle that matched none of the district's schools. */
export type UnmappedOrg = NonNullable<ImportPreview['oneRoster']>['unmappedOrgs'][number];

/**
 * The orgs of a OneRoster bundle that match no school, each with the school the coordinator
 * picks for it (or creates from it). Saving remembers every choice on the server, for this
 * import and the later ones, then tells the wizard to check the rows again.
 */
@Component({
  selector: 'tb-org-mapping',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './org-mapping.html',
  styleUrl: './org-mapping.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OrgMapping {
  private readonly write = createWrite();
  private readonly imports = inject(RosterImports);
  private readonly schoolData = inject(SchoolData);

  readonly orgs = input.required<UnmappedOrg[]>();
  readonly disabled = input(false);
  /** Emits once every choice is saved. */
  readonly saved = output<void>();

  protected readonly schools = httpResource(() => '/api/schools', {
    parse: (body) => schoolListSchema.parse(body),
  });
  protected readonly openSchools = computed<School[]>(() =>
    (this.schools.value()?.rows ?? []).filter((school) => school.closedOn === null),
  );
  protected readonly levels = schoolLevels;

  /** The school chosen for each org, by the org's sourcedId. */
  protected readonly choices = signal<Record<string, number>>({});
  protected readonly allChosen = computed(() =>
    this.orgs().every((org) => this.choices()[org.sourcedId] !== undefined),
  );
  protected readonly busy = signal(false);
  protected readonly problem = signal('');

  /** The org a new school is being made for, with the form's fields. */
  protected readonly creating = signal<string | null>(null);
  protected readonly newCode = signal('');
  protected readonly newName = signal('');
  protected readonly newLevel = signal<School['level']>('other');

  protected choose(sourcedId: string, schoolId: number) {
    this.choices.update((choices) => ({ ...choices, [sourcedId]: schoolId }));
  }

  protected startCreating(org: UnmappedOrg) {
    this.creating.set(org.sourcedId);
    this.newName.set(org.name);
    this.newCode.set(
      org.identifier
        .replace(/[^A-Za-z0-9]/g, '')
        .slice(0, 10)
        .toUpperCase(),
    );
    this.newLevel.set('other');
    this.problem.set('');
  }

  protected createSchool(org: UnmappedOrg) {
    this.busy.set(true);
    this.problem.set('');
    const request = this.schoolData.create({
      code: this.newCode(),
      name: this.newName(),
      level: this.newLevel(),
      address: '',
      lowestGrade: null,
      highestGrade: null,
      sendsToSchoolId: null,
      closedOn: null,
    });
    this.write.send(request, {
      next: (school) => {
        this.busy.set(false);
        this.creating.set(null);
        this.schools.reload();
        this.choose(org.sourcedId, school.id);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.problem.set(errorMessage(error, 'The school could not be created. Try again.'));
      },
    });
  }

  protected save() {
    if (!this.allChosen() || this.busy()) return;
    const choices = this.choices();
    this.busy.set(true);
    this.problem.set('');
    const request = forkJoin(
      this.orgs().map((org) =>
        this.imports.chooseOrgSchool({
          sourcedId: org.sourcedId,
          orgName: org.name,
          schoolId: choices[org.sourcedId]!,
        }),
      ),
    );
    this.write.send(request, {
      next: () => {
        this.busy.set(false);
        this.saved.emit();
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.problem.set(
          errorMessage(error, 'The choices could not be saved. Nothing was remembered; try again.'),
        );
      },
    });
  }
}
