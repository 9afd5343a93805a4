import type { IndexedFile, BundleRecord } from './oneroster-records';
import type { RowError } from './parsed-roster';

/** How the district's schools are found for a bundle's orgs. */
export interface OrgMatching {
  /** The district's school codes (upper case). */
  knownSchoolCodes?: ReadonlySet<string>;
  /** The district's school codes by school name, the name in lower case. */
  schoolCodeByName?: ReadonlyMap<string, string>;
  /** The school code each org sourcedId was mapped to at an earlier import. */
  schoolCodeByOrg?: ReadonlyMap<string, string>;
}

/** An org that matched no school of the district, for the coordinator to map. */
export interface UnmappedOrg {
  sourcedId: string;
  name: string;
  identifier: string;
  type: string;
  line: number;
}

/** Where an org's students belong: the school's code and the school org's line. */
export interface OrgSchool {
  schoolCode: string;
  line: number;
}

/** The outcome of looking up an org: its school, gone (tobedeleted), or a problem (reported). */
export type OrgLookup = OrgSchool | 'deleted' | undefined;

// OneRoster 1.1 CSV Tables §2.1 orgs.csv, 1.2 CSV Binding §3 orgs.csv: type is one of
// department, school, district, local, state, national; parentSourcedId names the org above.
const schoolType = 'school';

/**
 * Finds the district's school for the orgs of a bundle. An org matches a school by its
 * `identifier` (the school code), else by the mapping saved for its sourcedId at an earlier
 * import, else by its name. An org that is not a school (a department, a class's site) belongs
 * to the school above it through `parentSourcedId`. Without the district's codes (a bundle read
 * on its own) the identifier is taken as the code.
 */
export class OrgSchools {
  /** The orgs that matched no school, in file order. */
  readonly unmapped: UnmappedOrg[] = [];
  /** The orgs of the bundle that matched a school, by sourcedId. */
  readonly matched = new Map<string, { sourcedId: string; name: string; schoolCode: string }>();
  private readonly found = new Map<string, OrgLookup>();

  constructor(
    private readonly orgs: IndexedFile,
    private readonly matching: OrgMatching,
    private readonly errors: RowError[],
  ) {}

  /**
   * The school of the org `orgId` names, reporting a problem at `line`/`column` (the place
   * that names the org) when the org is not in orgs.csv, and at the org's own line when it
   * matches no school.
   */
  schoolOf(orgId: string, line: number, column: string): OrgLookup {
    if (this.orgs.deleted.has(orgId)) return 'deleted';
    const org = this.orgs.active.get(orgId);
    if (!org) {
      const saved = this.matching.schoolCodeByOrg?.get(orgId);
      if (saved) return { schoolCode: saved, line };
      this.errors.push({ line, column, message: `Org '${orgId}' is not in orgs.csv.` });
      return undefined;
    }
    if (this.found.has(orgId)) return this.found.get(orgId);
    const school = this.schoolAbove(org);
    this.found.set(orgId, school);
    // A department is remembered with the school above it, for a later delta without orgs.csv.
    if (school && school !== 'deleted' && !this.matched.has(orgId))
      this.matched.set(orgId, {
        sourcedId: orgId,
        name: org.cell('name'),
        schoolCode: school.schoolCode,
      });
    return school;
  }

  /** Whether the org is a school (or sits under one), so a user's list can prefer it. */
  isSchoolOrg(orgId: string): boolean {
    return this.orgs.active.get(orgId)?.cell('type').toLowerCase() === schoolType;
  }

  private schoolAbove(org: BundleRecord): OrgLookup {
    const seen = new Set<string>();
    let current: BundleRecord | undefined = org;
    while (current && current.cell('type').toLowerCase() !== schoolType) {
      const code = this.matchOf(current, false);
      if (code) return { schoolCode: code, line: current.line };
      seen.add(current.cell('sourcedId'));
      const parentId = current.cell('parentSourcedId');
      if (!parentId || seen.has(parentId)) break;
      if (this.orgs.deleted.has(parentId)) return 'deleted';
      current = this.orgs.active.get(parentId);
    }
    const target = current ?? org;
    const code = this.matchOf(target, true);
    if (code) return { schoolCode: code, line: target.line };
    this.reportUnmapped(target);
    return undefined;
  }

  private matchOf(org: BundleRecord, isSchool: boolean): string | undefined {
    const code = this.codeOf(org, isSchool);
    const sourcedId = org.cell('sourcedId');
    if (code) this.matched.set(sourcedId, { sourcedId, name: org.cell('name'), schoolCode: code });
    return code;
  }

  private codeOf(org: BundleRecord, isSchool: boolean): string | undefined {
    const { knownSchoolCodes, schoolCodeByName, schoolCodeByOrg } = this.matching;
    const identifier = org.cell('identifier');
    const byIdentifier = identifier.toUpperCase();
    if (identifier && knownSchoolCodes?.has(byIdentifier)) return byIdentifier;
    const saved = schoolCodeByOrg?.get(org.cell('sourcedId'));
    if (saved) return saved;
    const byName = schoolCodeByName?.get(org.cell('name').toLowerCase());
    if (byName) return byName;
    // A bundle read without the district's schools keeps the school's identifier as its code,
    // and the roster's own checks judge it.
    if (isSchool && identifier && !knownSchoolCodes) return identifier;
    return undefined;
  }

  private reportUnmapped(org: BundleRecord): void {
    const sourcedId = org.cell('sourcedId');
    if (this.unmapped.some((entry) => entry.sourcedId === sourcedId)) return;
    const name = org.cell('name');
    const identifier = org.cell('identifier');
    this.unmapped.push({ sourcedId, name, identifier, type: org.cell('type'), line: org.line });
    const shown = identifier ? `identifier '${identifier}'` : 'no identifier';
    this.errors.push({
      line: org.line,
      column: 'orgs.csv:identifier',
      message: `Org '${name}' (sourcedId '${sourcedId}', ${shown}) matches no school of the district by identifier, saved mapping or name; choose its school in the import's mapping step.`,
    });
  }
}
