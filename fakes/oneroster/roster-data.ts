/**
 * The roster a OneRoster REST provider holds, in the 1.2 REST binding's JSON shapes (1EdTech
 * OneRoster 1.2 Rostering Service, REST binding: org, user with roles and primaryOrg, class,
 * enrollment; references as `{ sourcedId, type }`). Invented people of the demo district.
 */
export interface Ref {
  href?: string;
  sourcedId: string;
  type: string;
}

interface Base {
  sourcedId: string;
  status: 'active' | 'tobedeleted';
  dateLastModified: string;
}

export interface Org extends Base {
  name: string;
  type: string;
  identifier: string;
  parent: Ref | null;
}

export interface User extends Base {
  enabledUser: boolean;
  username: string;
  givenName: string;
  familyName: string;
  preferredFirstName?: string;
  identifier: string;
  email: string;
  grades: string[];
  agents: Ref[];
  primaryOrg: Ref | null;
  roles: { roleType: 'primary' | 'secondary'; role: string; org: Ref }[];
}

export interface RoomClass extends Base {
  title: string;
  classCode: string;
  classType: string;
  school: Ref;
  subjects: string[];
}

export interface Enrollment extends Base {
  role: string;
  primary: boolean;
  user: Ref;
  class: Ref;
  school: Ref;
}

/** Every collection a provider serves. */
export interface RosterData {
  orgs: Org[];
  users: User[];
  classes: RoomClass[];
  enrollments: Enrollment[];
}

const changed = '2026-08-10T12:00:00.000Z';
const ref = (type: string, sourcedId: string): Ref => ({ sourcedId, type });

/** The fields every OneRoster record carries (its base class): id, status and last change. */
const base = (sourcedId: string): Base => ({
  sourcedId,
  status: 'active',
  dateLastModified: changed,
});

function school(id: string, name: string, identifier: string): Org {
  return {
    ...base(id),
    name,
    type: 'school',
    identifier,
    parent: ref('org', 'org-mbu'),
  };
}

function student(
  id: string,
  identifier: string,
  givenName: string,
  familyName: string,
  grade: string,
  orgId: string,
): User {
  return {
    ...base(id),
    enabledUser: true,
    username: identifier,
    givenName,
    familyName,
    identifier,
    email: '',
    grades: [grade],
    agents: [],
    primaryOrg: ref('org', orgId),
    roles: [{ roleType: 'primary', role: 'student', org: ref('org', orgId) }],
  };
}

function roomClass(id: string, title: string, orgId: string): RoomClass {
  return {
    ...base(id),
    title,
    classCode: id.toUpperCase(),
    classType: 'scheduled',
    school: ref('org', orgId),
    subjects: ['Music'],
  };
}

function seat(id: string, userId: string, classId: string, orgId: string): Enrollment {
  return {
    ...base(id),
    role: 'student',
    primary: false,
    user: ref('user', userId),
    class: ref('class', classId),
    school: ref('org', orgId),
  };
}

/** A small roster of the demo district: a few students of each school and their classes. */
export function demoRoster(): RosterData {
  return {
    orgs: [
      {
        ...base('org-mbu'),
        name: 'Merrow Basin Unified',
        type: 'district',
        identifier: 'MBU',
        parent: null,
      },
      school('org-hpms', 'Heron Point Middle', 'HPMS'),
      school('org-qhms', 'Quarry Hill Middle', 'QHMS'),
      school('org-trhs', 'Tamsin Ridge High', 'TRHS'),
      school('org-fbes', 'Firthbarrow Elementary', 'FBES'),
    ],
    users: [
      student('u-101', 'or.talia.brenn', 'Talia', 'Brenn', '07', 'org-hpms'),
      student('u-102', 'or.jonah.vesk', 'Jonah', 'Vesk', '06', 'org-hpms'),
      student('u-103', 'or.priya.lund', 'Priya', 'Lund', '08', 'org-qhms'),
      student('u-104', 'or.emeka.hart', 'Emeka', 'Hart', '10', 'org-trhs'),
      student('u-105', 'or.sol.adair', 'Sol', 'Adair', '04', 'org-fbes'),
      {
        ...student('u-201', 'T-OR-1', 'Dana', 'Merle', '', 'org-hpms'),
        grades: [],
        roles: [{ roleType: 'primary', role: 'teacher', org: ref('org', 'org-hpms') }],
      },
    ],
    classes: [
      roomClass('c-hp-band', 'Concert Band', 'org-hpms'),
      roomClass('c-qh-orch', 'Orchestra 8', 'org-qhms'),
      roomClass('c-tr-wind', 'Wind Ensemble', 'org-trhs'),
    ],
    enrollments: [
      seat('e-1', 'u-101', 'c-hp-band', 'org-hpms'),
      seat('e-2', 'u-102', 'c-hp-band', 'org-hpms'),
      seat('e-3', 'u-103', 'c-qh-orch', 'org-qhms'),
      seat('e-4', 'u-104', 'c-tr-wind', 'org-trhs'),
      { ...seat('e-5', 'u-201', 'c-hp-band', 'org-hpms'), role: 'teacher', primary: true },
    ],
  };
}
