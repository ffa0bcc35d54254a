/**
 * Lapbench's own lap colours for Compare, in order of selection: the reference lap takes our
 * signal amber, the rest are spaced around the hue circle for the dark graphite surface. Colour is
 * never the only cue: the legend names every lap in words.
 */
export const LAP_COLOURS = ["#f59e1b", "#5ab0ff", "#e36bd3", "#9bd651", "#ff7a70", "#a78bfa", "#e2c86b", "#3ed6e0"] as const;

export function lapColour(i: number): string {
  return LAP_COLOURS[i % LAP_COLOURS.length];
}
