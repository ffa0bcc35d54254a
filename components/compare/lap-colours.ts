/**
 * Lapbench's own lap colours for Compare, in order of selection: the reference lap takes our
 * signal amber, the second our data teal; the rest are from the Okabe–Ito palette (Okabe & Ito,
 * "Color Universal Design", 2008), ordered so that each added colour stays as far as possible
 * from those before it for viewers with protanopia, deuteranopia and tritanopia (checked in
 * tests/unit/compare/lap-colours.test.ts by simulation). Colour is never the only cue: every
 * chip and legend names its lap in words.
 */
export const LAP_COLOURS = [
  "#f59e1b", // our signal amber — the reference lap
  "#4fd1c5", // our data teal — the second lap
  "#0072B2", // Okabe–Ito blue
  "#009E73", // Okabe–Ito bluish green
  "#D55E00", // Okabe–Ito vermillion
  "#F0E442", // Okabe–Ito yellow
  "#e4e8ed", // our light graphite
  "#CC79A7", // Okabe–Ito reddish purple
] as const;

export function lapColour(i: number): string {
  return LAP_COLOURS[i % LAP_COLOURS.length];
}

/** Our outline ramp for low → high channel values: graphite, teal, amber. */
export const OUTLINE_RAMP: readonly (readonly [number, number, number])[] = [
  [58, 68, 80], // graphite (ink-600)
  [43, 179, 166], // teal (trace-500)
  [245, 158, 27], // amber (signal-500)
];

/** Colour at f ∈ [0, 1] along a ramp of RGB stops. */
export function rampColour(f: number, ramp: readonly (readonly [number, number, number])[] = OUTLINE_RAMP): string {
  const t = Math.min(1, Math.max(0, Number.isFinite(f) ? f : 0)) * (ramp.length - 1);
  const i = Math.min(ramp.length - 2, Math.floor(t));
  const u = t - i;
  const c = ramp[i].map((v, k) => Math.round(v + (ramp[i + 1][k] - v) * u));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

/** Time gained (teal) or lost (amber) against the reference, graphite when even. */
export const GAIN_COLOUR = "#4fd1c5";
export const LOSS_COLOUR = "#f59e1b";
