import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../../core/state/api-data';
import { map, type Observable } from 'rxjs';
import {
  studentDetailSchema,
  studentListSchema,
  studentSchema,
  type Student,
  type StudentDetail,
  type StudentInput,
  type StudentMove,
  type StudentPatch,
} from '@shared/api/student';
import { parsedWith } from '../../core/parse';

/** Reads and writes student records through `/api/students`. */
@Injectable({ providedIn: 'root' })
export class StudentData extends ApiData {
  /**
   * Up to `limit` active students of the user's schools whose name or student id matches
   * `text`, as a picker offers them (the API answers only the user's own schools' students).
   */
  findActive(text: string, limit: number): Observable<Student[]> {
    return this.http.get('/api/students', { params: { q: text, status: 'active', limit } }).pipe(
      parsedWith(studentListSchema),
      map((list) => list.rows),
    );
  }

  /** The record of `id()` with its school, seats and moves; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<StudentDetail | undefined> {
    return this.resource(
      () => (id() === undefined ? undefined : `/api/students/${id()}`),
      studentDetailSchema,
    );
  }

  create(input: StudentInput): Observable<Student> {
    return this.write('POST', '/api/students', input, studentSchema);
  }

  update(id: number, patch: StudentPatch): Observable<Student> {
    return this.write('PATCH', `/api/students/${id}`, patch, studentSchema);
  }

  /** Moves the student to another school; the move is kept in their history. */
  move(id: number, move: StudentMove): Observable<unknown> {
    return this.http.post(`/api/students/${id}/move`, move);
  }
}
