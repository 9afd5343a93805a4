// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpClient } from '@angular/common/http';
import { Injector, runInInjectionContext } from '@angular/core';
import { firstValueFrom, of } from 'rxjs';
import { describe, expect, it } from 'vitest';
import * as z from 'zod';
import { RecordWrites } from './record-data';

const roomSchema = z.object({ id: z.number(), name: z.string() });
type Room = z.infer<typeof roomSchema>;

class RoomData extends RecordWrites<Room, { name: string }, { name?: string }> {
  constructor() {
    super('/api/rooms', roomSchema);
  }
}

/** A RoomData whose HttpClient answers `answer` and notes each request it was asked for. */
function roomData(answer: unknown): { rooms: RoomData; asked: unknown[][] } {
  const asked: unknown[][] = [];
  const http = {
    request: (...call: unknown[]) => {
      asked.push(call);
      return of(answer);
    },
  };
  const injector = Injector.create({ providers: [{ provide: HttpClient, useValue: http }] });
  return { rooms: runInInjectionContext(injector, () => new RoomData()), asked };
}

describe('RecordWrites', () => {
  it('should create with a POST to the route and change with a PATCH to the record', async () => {
    const { rooms, asked } = roomData({ id: 4, name: 'Band room' });
    await expect(firstValueFrom(rooms.create({ name: 'Band room' }))).resolves.toEqual({
      id: 4,
      name: 'Band room',
    });
    await firstValueFrom(rooms.update(4, { name: 'Band room' }));
    expect(asked).toEqual([
      ['POST', '/api/rooms', { body: { name: 'Band room' } }],
      ['PATCH', '/api/rooms/4', { body: { name: 'Band room' } }],
    ]);
  });

  it('should refuse an answer its schema does not accept', async () => {
    const { rooms } = roomData({ id: 'four' });
    await expect(firstValueFrom(rooms.create({ name: 'Band room' }))).rejects.toThrow();
  });
});
