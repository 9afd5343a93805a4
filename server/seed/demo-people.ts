/**
 * The invented Merrow Basin Unified district: its schools and staff accounts. Every name here
 * is made up for the demonstration. Each school has the grades it serves (0 is kindergarten)
 * and the school its students move up to after its last grade: both elementaries feed a middle
 * school and every middle school feeds the high school.
 */
export const demoDistrict = {
  name: 'Merrow Basin Unified',
  shortName: 'Merrow Basin',
  timeZone: 'America/Los_Angeles',
  contactAddress: 'Music Office, 200 Basin Avenue, Merrow Basin',
  contactPhone: '(555) 010-4400',
  contactEmail: 'music.office@merrowbasin.example',
  mailSenderName: 'Merrow Basin Unified Music',
};

export const demoSchools = [
  { code: 'HPMS', name: 'Heron Point Middle', level: 'middle', address: '410 Heron Point Road, Merrow Basin', students: 330, lowestGrade: 6, highestGrade: 8, sendsTo: 'TRHS' },
  { code: 'QHMS', name: 'Quarry Hill Middle', level: 'middle', address: '92 Quarry Hill Lane, Merrow Basin', students: 300, lowestGrade: 6, highestGrade: 8, sendsTo: 'TRHS' },
  { code: 'TRHS', name: 'Tamsin Ridge High', level: 'high', address: '1 Ridgeline Drive, Tamsin', students: 400, lowestGrade: 9, highestGrade: 12, sendsTo: null },
  { code: 'FBES', name: 'Firthbarrow Elementary', level: 'elementary', address: '18 Firthbarrow Court, Merrow Basin', students: 200, lowestGrade: 0, highestGrade: 5, sendsTo: 'HPMS' },
  { code: 'OMMS', name: 'Orchard Mill Middle', level: 'middle', address: '77 Millrace Way, Orchard', students: 260, lowestGrade: 6, highestGrade: 8, sendsTo: 'TRHS' },
  { code: 'CWES', name: 'Cedarwash Elementary', level: 'elementary', address: '5 Cedarwash Road, Tamsin', students: 180, lowestGrade: 0, highestGrade: 5, sendsTo: 'QHMS' },
] as const;

export type DemoSchoolCode = (typeof demoSchools)[number]['code'];

/** Staff and student accounts; all e-mail addresses are @merrowbasin.example. */
export const demoUsers: {
  email: string;
  name: string;
  role: 'coordinator' | 'director' | 'technician' | 'viewer' | 'student';
  schools: DemoSchoolCode[];
}[] = [
  { email: 'coordinator@merrowbasin.example', name: 'Renata Okonkwo-Hale', role: 'coordinator', schools: [] },
  { email: 'director.hpms@merrowbasin.example', name: 'Marcus Feldqvist', role: 'director', schools: ['HPMS'] },
  { email: 'director.qhms@merrowbasin.example', name: 'Ines Tallowbrook', role: 'director', schools: ['QHMS'] },
  { email: 'director.trhs@merrowbasin.example', name: 'Tobias Wrenfield', role: 'director', schools: ['TRHS'] },
  { email: 'director.fbes@merrowbasin.example', name: 'Odalys Brennquist', role: 'director', schools: ['FBES', 'CWES'] },
  { email: 'director.omms@merrowbasin.example', name: 'Dario Quillfeather', role: 'director', schools: ['OMMS'] },
  { email: 'technician@merrowbasin.example', name: 'Dale Pemberthy', role: 'technician', schools: [] },
  { email: 'viewer.trhs@merrowbasin.example', name: 'Priya Castellane', role: 'viewer', schools: ['TRHS'] },
  { email: 'student.hpms@merrowbasin.example', name: 'Toby Arkwright-Lund', role: 'student', schools: ['HPMS'] },
];

export const firstNames = [
  'Ada', 'Amir', 'Aria', 'Bea', 'Caleb', 'Celia', 'Dev', 'Dina', 'Eli', 'Elena', 'Emeka', 'Fern',
  'Felix', 'Gia', 'Hana', 'Hugo', 'Ines', 'Isaac', 'Jonah', 'Juno', 'Kai', 'Kira', 'Leo', 'Lina',
  'Mateo', 'Maya', 'Milo', 'Nadia', 'Nico', 'Noor', 'Omar', 'Orla', 'Pax', 'Pilar', 'Quinn', 'Rafe',
  'Rhea', 'Sami', 'Sana', 'Theo', 'Tova', 'Uma', 'Vik', 'Wren', 'Xavi', 'Yara', 'Zane', 'Zoë',
  'Anouk', 'Bram', 'Cosmo', 'Dalia', 'Ezra', 'Freya', 'Gideon', 'Hollis', 'Ivo', 'Jessa', 'Kofi',
  'Lupe', 'Marlo', 'Nell', 'Otto', 'Petra', 'Rosa', 'Silas', 'Tamsin', 'Vera', 'Wim', 'Yusuf',
];

export const lastNames = [
  'Abernathy', 'Balogun', 'Castellanos', 'Delacroix', 'Eriksen', 'Fairweather', 'Galloway',
  'Hargrove', 'Ibarra', 'Jablonski', 'Kowalczyk', 'Lindqvist', 'Marchetti', 'Nakamura', 'Okafor',
  'Pemberton', 'Quintero', 'Rasmussen', 'Sandoval', 'Thistlewood', 'Underhill', 'Valdivia',
  'Whitcombe', 'Yilmaz', 'Zielinski', 'Ashdown', 'Birchall', 'Coldwater', 'Dunmore', 'Everly',
  'Foxworth', 'Greenhalgh', 'Holloway', 'Ironside', 'Kettering', 'Larkspur', 'Merriweather',
  'Northcott', 'Oakhurst', 'Penrose', 'Redfern', 'Stonebridge', 'Tennant', 'Vossberg', 'Wexley',
  'Achebe', 'Brandvold', 'Cruz-Medina', 'Duchesne', 'Fitzgerald-Oduya', 'Haddad', 'Muñoz', 'Ng',
  "O'Rourke", 'Park', 'Santos', 'Tran', 'Varga', 'Weiss', 'Xu',
];
