// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpErrorResponse } from '@angular/common/http';
import { FormControl, FormGroup, Validators } from '@angular/forms';
import { Subject } from 'rxjs';
import { describe, expect, it } from 'vitest';
import { createRecordSave } from './record-save';

const refusal = (status: number, message: string, fieldErrors: unknown[] = []) =>
  new HttpErrorResponse({ status, error: { error: { status, code: 'x', message, fieldErrors } } });
const recordForm = () => new FormGroup({ name: new FormControl('Wind ensemble') });

describe('createRecordSave', () => {
  it('should refuse to send an invalid form and show its controls’ messages', () => {
    const save = createRecordSave();
    const form = new FormGroup({ name: new FormControl('', Validators.required) });
    expect(save.ready(form)).toBe(false);
    expect(form.controls.name.touched).toBe(true);
  });

  it('should refuse to send while a save is on its way, and clear the note and message when one starts', () => {
    const save = createRecordSave();
    const form = recordForm();
    save.saved.set(true);
    save.saveError.set('Earlier failure.');
    const answer = new Subject<number>();
    const values: number[] = [];
    save.send(form, answer, (value) => values.push(value));
    expect(save.saved()).toBe(false);
    expect(save.saveError()).toBe('');
    expect(save.ready(form)).toBe(false);
    answer.next(4);
    answer.complete();
    expect(values).toEqual([4]);
    expect(save.ready(form)).toBe(true);
  });

  it('should turn the conflict notice on for a 409, or show the message when the conflict is off', () => {
    const edit = createRecordSave();
    const answer = new Subject<number>();
    edit.send(recordForm(), answer, () => undefined);
    answer.error(refusal(409, 'Someone saved first.'));
    expect(edit.conflict()).toBe(true);
    expect(edit.saveError()).toBe('');

    const adding = createRecordSave();
    const second = new Subject<number>();
    adding.send(recordForm(), second, () => undefined, { conflict: false });
    second.error(refusal(409, 'That asset tag is taken.'));
    expect(adding.conflict()).toBe(false);
    expect(adding.saveError()).toBe('That asset tag is taken.');
  });

  it('should put a 400’s field errors under their fields instead of a message', () => {
    const save = createRecordSave();
    const form = recordForm();
    const answer = new Subject<number>();
    save.send(form, answer, () => undefined);
    answer.error(refusal(400, 'Check the form.', [{ field: 'name', message: 'Too long.' }]));
    expect(form.controls.name.errors).toEqual({ server: 'Too long.' });
    expect(save.saveError()).toBe('');
  });

  it('should keep the note when asked, and hand a failure to its own handler when given one', () => {
    const save = createRecordSave();
    save.saved.set(true);
    const seen: unknown[] = [];
    const answer = new Subject<number>();
    save.send(recordForm(), answer, () => undefined, {
      keepNote: true,
      error: (error) => seen.push(error),
    });
    expect(save.saved()).toBe(true);
    const failure = refusal(500, 'The logo could not be saved.');
    answer.error(failure);
    expect(seen).toEqual([failure]);
    expect(save.saveError()).toBe('');
  });
});
