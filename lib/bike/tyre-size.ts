/**
 * Nominal size of a motorcycle tyre from its sidewall marking, e.g. "120/70 ZR17":
 * D = 25.4·rim + 2·width·aspect/100 (ISO 5751 / ETRTO practice), circumference π·D.
 * The real rolling circumference is a little smaller (the tyre squats under load and lean),
 * so this is a starting hint, not a setting: measure the rolled distance per turn for the bike.
 */
export interface TyreSize {
  widthMm: number;
  aspectPct: number;
  rimIn: number;
  /** Nominal overall diameter (mm). */
  diameterMm: number;
  /** Nominal circumference π·D (mm). */
  circumferenceMm: number;
}

// Width/aspect, an optional speed or construction code (ZR, R, B, -), then the rim in inches.
const MARKING = /^\s*(\d{2,3}(?:\.\d+)?)\s*\/\s*(\d{2,3})\s*(?:[A-Z]{0,3}|-)\s*(\d{2}(?:\.\d+)?)\s*$/i;

/** Parse a marking; null when it is not of the form width/aspect [code] rim. */
export function tyreSize(marking: string): TyreSize | null {
  const m = MARKING.exec(marking);
  if (!m) return null;
  const widthMm = Number(m[1]);
  const aspectPct = Number(m[2]);
  const rimIn = Number(m[3]);
  if (!(widthMm >= 50 && widthMm <= 400 && aspectPct >= 20 && aspectPct <= 120 && rimIn >= 8 && rimIn <= 23)) return null;
  const diameterMm = 25.4 * rimIn + (2 * widthMm * aspectPct) / 100;
  return { widthMm, aspectPct, rimIn, diameterMm, circumferenceMm: Math.PI * diameterMm };
}
