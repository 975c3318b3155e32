/**
 * Series colours: the Okabe–Ito colour-universal-design set (common practice for
 * colour-blind-safe plots), reordered for contrast on white, yellow dropped as too pale.
 * Dash patterns repeat the distinction for monochrome prints.
 */
export const PALETTE = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000'] as const;
export const DASHES = [undefined, '7 3', '2 3', '9 3 2 3'] as const;

export function colorAt(i: number): string {
  return PALETTE[i % PALETTE.length];
}

/** Dashing changes only after the colours run out, so the first seven series stay solid. */
export function dashAt(i: number): string | undefined {
  return DASHES[Math.floor(i / PALETTE.length) % DASHES.length];
}

/** Colours for guides and chrome. */
export const INK = { text: '#1d2433', muted: '#5b6475', grid: '#e3e6ec', minorGrid: '#f1f3f6', axis: '#8a92a3', target: '#3a3f4b', mark: '#b3261e', region: '#2a9d8f' } as const;
