import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import { byRole, everyRole, useTestApp } from '../support/test-app';

/** A row of `/api/students`. */
export interface Row {
  id: number;
  studentNumber: string;
  firstName: string;
  lastName: string;
  grade: number;
  gradeLabel: string;
  schoolId: number;
  schoolCode: string;
  status: string;
  ensembles: string;
  ensembleIds: number[];
  instruments: string;
  instrumentIds: string[];
  version: number;
  guardianEmail?: string | null;
}

/** The demo district's app with every role signed in, and the steps the student-roster tests take. */
export function useStudentsApp() {
  const app = useTestApp({ signIn: everyRole });
  const roles = byRole(app.clients);

  async function query<Result>(text: string): Promise<Result[]> {
    return rowsOf<Result>(await app.database.db.execute(sql.raw(text)));
  }

  async function firstStudentOf(code: string): Promise<Row> {
    const response = await roles.coordinator.get(
      `/api/students?schoolCode=${code}&status=active&limit=1`,
    );
    return response.body.rows[0];
  }

  /** A new HPMS student's fields, with a fresh student number. */
  function newStudent(overrides: object = {}) {
    return {
      studentNumber: `T${Math.floor(Math.random() * 1e9)}`,
      firstName: 'Wilhelmina',
      lastName: 'Quorndon',
      grade: 7,
      schoolId: app.schoolIds['HPMS'],
      guardianName: 'Alex Quorndon',
      guardianEmail: 'alex.quorndon@families.merrowbasin.example',
      ...overrides,
    };
  }

  return { app, ...roles, query, firstStudentOf, newStudent };
}
