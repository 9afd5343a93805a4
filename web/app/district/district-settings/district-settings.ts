import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  signal,
  untracked,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import type { Observable } from 'rxjs';
import {
  districtContactSchema,
  districtNameSchema,
  districtPatchSchema,
  logoByteLimit,
  timeZoneSchema,
  type District,
} from '@shared/api/district';
import { CurrentDistrict } from '../../core/district/current-district';
import { Field } from '../../core/forms/field';
import { SaveRow } from '../../core/forms/save-row';
import { fieldMessage, schemaValidator } from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { ConflictNotice } from '../../core/record-page/conflict-notice';
import { AgreementTextEditor } from '../agreement-text/agreement-text';
import { DistrictData } from '../district-data';
import { FeeScheduleEditor } from '../fee-schedule/fee-schedule';
import { createRecordSave } from '../../core/forms/record-save';
import { usualTimeZones } from '../../core/district/time-zones';

/**
 * The coordinator's screen for the district's own settings: name, logo, office, time zone, mail,
 * the loan agreement text and the usage-fee schedule.
 */
@Component({
  selector: 'tb-district-settings',
  imports: [
    AgreementTextEditor,
    ConflictNotice,
    FeeScheduleEditor,
    Field,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    PageState,
    ReactiveFormsModule,
    SaveRow,
  ],
  templateUrl: './district-settings.html',
  styleUrl: './district-settings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DistrictSettings {
  protected readonly recordSave = createRecordSave();
  private readonly data = inject(DistrictData);
  private readonly currentDistrict = inject(CurrentDistrict);

  protected readonly district = rxResource({ stream: () => this.data.get() });
  protected readonly fieldMessage = fieldMessage;
  protected readonly logoMessage = signal('');
  protected readonly logoError = signal('');
  protected readonly timeZones = signal<readonly string[]>(usualTimeZones);

  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', schemaValidator(districtNameSchema)],
    shortName: ['', schemaValidator(districtPatchSchema.shape.shortName.unwrap())],
    timeZone: ['', schemaValidator(timeZoneSchema)],
    address: ['', schemaValidator(districtContactSchema.shape.address)],
    phone: ['', schemaValidator(districtContactSchema.shape.phone)],
    email: ['', schemaValidator(districtContactSchema.shape.email)],
    mailSenderName: ['', schemaValidator(districtPatchSchema.shape.mailSenderName.unwrap())],
  });

  constructor() {
    // The form shows the district as loaded, and again after every save.
    effect(() => {
      const district = this.district.value();
      if (district) untracked(() => this.fill(district));
    });
  }

  private fill(district: District): void {
    this.form.reset({
      name: district.name,
      shortName: district.shortName,
      timeZone: district.timeZone,
      address: district.contact.address,
      phone: district.contact.phone,
      email: district.contact.email,
      mailSenderName: district.mailSenderName,
    });
    if (!usualTimeZones.includes(district.timeZone))
      this.timeZones.set([district.timeZone, ...usualTimeZones]);
  }

  protected save(current: District): void {
    if (!this.recordSave.ready(this.form)) return;
    const value = this.form.getRawValue();
    this.send(
      this.data.update({
        version: current.version,
        name: value.name,
        shortName: value.shortName,
        timeZone: value.timeZone,
        mailSenderName: value.mailSenderName,
        contact: { address: value.address, phone: value.phone, email: value.email },
      }),
      () => this.recordSave.saved.set(true),
    );
  }

  protected chooseLogo(current: District, event: Event): void {
    const picker = event.target as HTMLInputElement;
    const file = picker.files?.[0];
    picker.value = '';
    this.logoMessage.set('');
    this.logoError.set('');
    if (!file) return;
    if (!['image/png', 'image/svg+xml'].includes(file.type)) {
      this.logoError.set('A logo is a PNG or an SVG image.');
      return;
    }
    if (file.size > logoByteLimit) {
      this.logoError.set(
        `That file is ${(file.size / 1024 / 1024).toFixed(1)} MB; a logo is at most 1 MB.`,
      );
      return;
    }
    const reader = new FileReader();
    reader.onload = () =>
      this.send(
        this.data.update({ version: current.version, logo: String(reader.result) }),
        () => this.logoMessage.set('The new logo is saved.'),
        (error) => this.logoError.set(errorMessage(error, 'The logo could not be saved.')),
      );
    reader.readAsDataURL(file);
  }

  protected removeLogo(current: District): void {
    this.logoMessage.set('');
    this.logoError.set('');
    this.send(
      this.data.update({ version: current.version, logo: null }),
      () => this.logoMessage.set('The logo is removed.'),
      (error) => this.logoError.set(errorMessage(error, 'The logo could not be removed.')),
    );
  }

  protected reload(): void {
    this.recordSave.conflict.set(false);
    this.district.reload();
  }

  private send(request: Observable<District>, done: () => void, error?: (error: unknown) => void) {
    const next = (district: District) => {
      this.district.set(district);
      this.currentDistrict.update(district);
      done();
    };
    this.recordSave.send(this.form, request, next, { error });
  }
}
