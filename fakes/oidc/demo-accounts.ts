/** An account the local identity provider can sign in as. */
export interface FakeAccount {
  /** The account's e-mail address; it is also the subject (`sub`) of its tokens. */
  email: string;
  /** The display name returned as the `name` claim. */
  name: string;
  /** What the person does in the district, shown on the sign-in page only. */
  role: string;
  /** An extra line shown under the account on the sign-in page. */
  note?: string;
}

/** The invented people of Merrow Basin Unified that the demo district is seeded with. */
export const demoAccounts: FakeAccount[] = [
  {
    email: 'coordinator@merrowbasin.example',
    name: 'Renata Okonkwo-Hale',
    role: 'District music coordinator',
    note: 'Sees every school',
  },
  {
    email: 'director.hpms@merrowbasin.example',
    name: 'Marcus Feldqvist',
    role: 'Band director, Heron Point Middle',
  },
  {
    email: 'director.qhms@merrowbasin.example',
    name: 'Ines Tallowbrook',
    role: 'Orchestra and band director, Quarry Hill Middle',
  },
  {
    email: 'director.trhs@merrowbasin.example',
    name: 'Tobias Wrenfield',
    role: 'Band and orchestra director, Tamsin Ridge High',
  },
  {
    email: 'director.fbes@merrowbasin.example',
    name: 'Odalys Brennquist',
    role: 'Elementary music, Firthbarrow and Cedarwash',
  },
  {
    email: 'director.omms@merrowbasin.example',
    name: 'Dario Quillfeather',
    role: 'Band director, Orchard Mill Middle',
  },
  {
    email: 'technician@merrowbasin.example',
    name: 'Dale Pemberthy',
    role: 'Instrument technician',
    note: 'Repairs and the instrument fleet',
  },
  {
    email: 'viewer.trhs@merrowbasin.example',
    name: 'Priya Castellane',
    role: 'Principal, Tamsin Ridge High',
    note: 'Read-only',
  },
  {
    email: 'student.hpms@merrowbasin.example',
    name: 'Toby Arkwright-Lund',
    role: 'Student, Heron Point Middle',
  },
];

/** Finds an account by e-mail address, ignoring case and surrounding spaces. */
export function findAccountByEmail(
  accounts: readonly FakeAccount[],
  email: string,
): FakeAccount | undefined {
  const wanted = email.trim().toLowerCase();
  return accounts.find((account) => account.email.toLowerCase() === wanted);
}
