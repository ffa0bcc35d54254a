/**
 * Corner names on Compare's x axis that never overlap. Each label is centred on its corner's
 * pixel position; when the full names collide anywhere in view, every label takes its short
 * form ("Turn 5" → "T5"); when even those collide, labels are kept left to right and one that
 * would touch the last kept label is left out (blank). Widths are measured by the caller (canvas
 * measureText in the browser), so the choice follows the font actually drawn.
 */
export interface CornerMark {
  /** Centre of the label, px. */
  pos: number;
  name: string;
}

/** Short form of a corner name: "Turn 5" → "T5", "Back Straight Kink" → "BSK", "Hairpin" → "Hai.". */
export function shortCornerName(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return "";
  const last = words[words.length - 1];
  if (words.length > 1 && /\d/.test(last)) return words.slice(0, -1).map((w) => w[0].toUpperCase()).join("") + last;
  if (words.length > 1) return words.map((w) => w[0].toUpperCase()).join("");
  return last.length <= 4 ? last : `${last.slice(0, 3)}.`;
}

/** Whether labels of these widths, centred at their positions (ascending), keep `gapPx` apart. */
function fits(pos: readonly number[], widths: readonly number[], gapPx: number): boolean {
  for (let i = 1; i < pos.length; i++) if (pos[i - 1] + widths[i - 1] / 2 + gapPx > pos[i] - widths[i] / 2) return false;
  return true;
}

/**
 * The text to draw at each mark (same order as given; "" = not labelled). Marks must be in
 * ascending position. `measure` gives a text's width in px.
 */
export function cornerLabels(marks: readonly CornerMark[], measure: (text: string) => number, gapPx = 6): string[] {
  const pos = marks.map((m) => m.pos);
  const full = marks.map((m) => m.name);
  if (fits(pos, full.map(measure), gapPx)) return full;
  const short = marks.map((m) => shortCornerName(m.name));
  const widths = short.map(measure);
  if (fits(pos, widths, gapPx)) return short;
  const out = short.map(() => "");
  let right = -Infinity;
  for (let i = 0; i < marks.length; i++) {
    if (pos[i] - widths[i] / 2 < right + gapPx) continue;
    out[i] = short[i];
    right = pos[i] + widths[i] / 2;
  }
  return out;
}
