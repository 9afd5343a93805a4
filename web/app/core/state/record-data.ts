import type { HttpResourceRef } from '@angular/common/http';
import type { Observable } from 'rxjs';
import type { z } from 'zod';
import { ApiData } from './api-data';

/**
 * The writes of a record route (the server's `recordRoutes`): create is `POST <path>` and a change
 * is `PATCH <path>/<id>`, each answering the record, parsed by its shared schema. A data class
 * extends it with its route's address and schema, and adds the calls only its route has.
 */
export abstract class RecordWrites<Row, Input, Patch> extends ApiData {
  constructor(
    protected readonly path: string,
    private readonly rowSchema: z.ZodType<Row>,
  ) {
    super();
  }

  create(input: Input): Observable<Row> {
    return this.write('POST', this.path, input, this.rowSchema);
  }

  update(id: number, patch: Patch): Observable<Row> {
    return this.write('PATCH', `${this.path}/${id}`, patch, this.rowSchema);
  }
}

/**
 * A record route whose record page reads one record (`GET <path>/<id>`, answered as `Detail`,
 * which may carry more than the list's row) as well as creating and changing it.
 */
export abstract class RecordData<Row, Input, Patch, Detail = Row> extends RecordWrites<
  Row,
  Input,
  Patch
> {
  constructor(
    path: string,
    rowSchema: z.ZodType<Row>,
    private readonly detailSchema: z.ZodType<Detail>,
  ) {
    super(path, rowSchema);
  }

  /** The record of `id()`, read again whenever it changes; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<Detail | undefined> {
    return this.resource(() => {
      const recordId = id();
      return recordId === undefined ? undefined : `${this.path}/${recordId}`;
    }, this.detailSchema);
  }
}
