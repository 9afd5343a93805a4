import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { takeSchema, type Take } from '@shared/api/take';
import type { TakeAnalysis } from '@shared/listening';

/** A student's takes on the server: keep one, send it to their directors. */
@Injectable({ providedIn: 'root' })
export class Takes {
  private readonly http = inject(HttpClient);

  /** Keeps a take (its recording and the analysis the browser made of it). */
  keep(
    recording: Blob,
    requirementCode: string,
    tempoAsked: number,
    analysis: TakeAnalysis,
  ): Observable<Take> {
    const form = new FormData();
    const extension = recording.type.includes('ogg')
      ? 'ogg'
      : recording.type.includes('mp4')
        ? 'm4a'
        : 'webm';
    form.append('requirementCode', requirementCode);
    form.append('tempoAsked', String(Math.round(tempoAsked)));
    form.append('analysis', JSON.stringify(analysis));
    form.append('recording', recording, `take.${extension}`);
    return this.http.post('/api/takes', form).pipe(map((body) => takeSchema.parse(body)));
  }

  /**
   * Keeps the take a director recorded while hearing a student, as evidence of the pass-off:
   * sent at once to the student's directors and the coordinator, and heard by the student.
   */
  keepHeard(
    recording: Blob,
    studentId: number,
    requirementCode: string,
    tempoAsked: number,
    analysis: TakeAnalysis,
  ): Observable<Take> {
    const form = new FormData();
    form.append('studentId', String(studentId));
    form.append('requirementCode', requirementCode);
    form.append('tempoAsked', String(Math.round(tempoAsked)));
    form.append('analysis', JSON.stringify(analysis));
    form.append('recording', recording, recording instanceof File ? recording.name : 'take.webm');
    return this.http.post('/api/takes/heard', form).pipe(map((body) => takeSchema.parse(body)));
  }

  /** Sends a kept take to the student's directors: ready to be heard. */
  send(id: number): Observable<Take> {
    return this.http.post(`/api/takes/${id}/send`, {}).pipe(map((body) => takeSchema.parse(body)));
  }
}
