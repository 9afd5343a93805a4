import { Injectable } from '@angular/core';
import { RecordData } from '../../core/state/record-data';
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
export class StudentData extends RecordData<Student, StudentInput, StudentPatch, StudentDetail> {
  constructor() {
    super('/api/students', studentSchema, studentDetailSchema);
  }

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

  /** Moves the student to another school; the move is kept in their history. */
  move(id: number, move: StudentMove): Observable<unknown> {
    return this.http.post(`/api/students/${id}/move`, move);
  }
}
