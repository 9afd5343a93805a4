/**
 * The chart colours: the app's teal and brass first, then hues chosen to stay apart from each
 * other and from the warm greys. Charts label their values as well, so no reading depends on
 * colour alone.
 */
export const chartPalette = {
  teal: '#0b6870',
  brass: '#c2820f',
  /** Warm greys, darkest first: text, axis lines, grid lines. */
  ink: '#3b3531',
  muted: '#6b635c',
  line: '#d9d0c6',
  faint: '#efe9e2',
  /** Series colours in the order series take them. */
  series: ['#0b6870', '#c2820f', '#6d4c8f', '#b5523b', '#3d6fa8', '#6b7f2a', '#a8437a', '#8a7f74'],
} as const;

/** The colour of the series at an index, wrapping round when there are more series than hues. */
export function seriesColour(index: number): string {
  return chartPalette.series[index % chartPalette.series.length]!;
}

/** The text style every chart shares: the app's typeface and warm grey ink. */
export const chartText = {
  fontFamily: 'Public Sans, system-ui, sans-serif',
  color: chartPalette.ink,
  fontSize: 12,
} as const;
