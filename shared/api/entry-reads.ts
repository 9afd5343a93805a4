/** A read a screen makes, as its data class asks for it (same URL, same parameter order). */
export interface ScreenRead {
  url: string;
  params?: Record<string, string | number>;
  /**
   * For a paged list read from offset 0 (`limit` and `offset` among the params): the pages after
   * it are read too, as the screen will ask for them, as many as the first page's total implies.
   */
  paged?: boolean;
}

/** A read answered in the index page: the read as the web app asks for it, and the API's answer. */
export interface EmbeddedRead extends ScreenRead {
  body: unknown;
}

/** The id of the data block holding the answers the index page is served with. */
export const embeddedReadsId = 'tb-embedded-reads';

/** The ensembles the pass-off entry screen offers, as it asks for them. */
export const entryEnsembleQuery = { sort: 'name:asc', limit: 500 };
/** Rows per page of a pass-off read (the list API's largest page). */
export const passOffPageSize = 1000;
/** Rows of an ensemble's rung column (an ensemble seats fewer students). */
export const rungRowsLimit = 1000;

/**
 * What the pass-off entry screen reads before it can show the chosen ensemble: the ensembles,
 * the ladder in force, the ensemble's seats, the first page of its pass-offs and its students'
 * rungs, in the order and with the parameters the screen's data classes use.
 */
export function entryReads(ensembleId: number | null): ScreenRead[] {
  const reads: ScreenRead[] = [
    { url: '/api/ensembles', params: entryEnsembleQuery },
    { url: '/api/ladder' },
  ];
  if (ensembleId) {
    reads.push(
      { url: `/api/ensembles/${ensembleId}` },
      {
        url: '/api/pass-offs',
        params: { ensembleId, limit: passOffPageSize, offset: 0 },
        paged: true,
      },
      { url: '/api/analytics/students', params: { ensembleId, limit: rungRowsLimit } },
    );
  }
  return reads;
}

/**
 * What the index page served for the pass-off screen carries for a signed-in user, so the first
 * screen needs no read of its own: who is signed in, the district and its school years (the shell
 * and the year picker ask for them), then the entry screen's reads.
 */
export function embeddedEntryReads(ensembleId: number | null): ScreenRead[] {
  return [
    { url: '/api/me' },
    { url: '/api/district' },
    { url: '/api/school-years' },
    ...entryReads(ensembleId),
  ];
}

/** The pages after a paged read's first that a list answer's `total` implies. */
export function pagesAfter(read: ScreenRead, firstPage: unknown): ScreenRead[] {
  const limit = Number(read.params?.['limit']);
  const total = (firstPage as { total?: unknown } | null)?.total;
  if (!(limit > 0) || typeof total !== 'number') return [];
  const pages: ScreenRead[] = [];
  for (let offset = limit; offset < total; offset += limit)
    pages.push({ url: read.url, params: { ...read.params, offset } });
  return pages;
}
