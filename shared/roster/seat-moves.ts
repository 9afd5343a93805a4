/** A change of an ensemble seat as an import plan lists it: joins when `after`, leaves when `before`. */
export interface SeatChange {
  field: string;
  before: string | null;
  after: string | null;
}

function joinNames(names: string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}

/**
 * One sentence for a student's ensemble moves in an import: the seats left first, then the ones
 * joined ("Leaves Sixth Grade Band, joins Concert Band"); null when the changes hold none.
 */
export function describeSeatMoves(changes: readonly SeatChange[]): string | null {
  const seats = changes.filter((change) => change.field === 'ensemble');
  const leaves = seats.flatMap((change) =>
    change.after === null && change.before ? [change.before] : [],
  );
  const joins = seats.flatMap((change) => (change.after !== null ? [change.after] : []));
  const parts: string[] = [];
  if (leaves.length > 0) parts.push(`leaves ${joinNames(leaves)}`);
  if (joins.length > 0) parts.push(`joins ${joinNames(joins)}`);
  if (parts.length === 0) return null;
  const sentence = parts.join(', ');
  return sentence.charAt(0).toUpperCase() + sentence.slice(1);
}
