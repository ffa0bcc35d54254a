/**
 * Which GPS fixes are too poor to use, from the satellite count and the horizontal dilution of
 * precision (HDOP) a file gives (NMEA GGA fields 7 and 8, GPX <sat> and <hdop>).
 *
 * - At least 4 satellites: a fix solves for four unknowns (three position coordinates and the
 *   receiver's clock offset), so fewer than four cannot give a full position without assuming the
 *   altitude (a 2-D fix). Textbook GPS principle, written from memory.
 * - HDOP at most 5: Lapbench default. Commonly quoted DOP ratings (from memory) call 2–5 "good"
 *   and 5–10 "moderate"; a circuit with open sky gives ~1, so 5 leaves room and still drops fixes
 *   whose horizontal error is several times the usual.
 */
export const MIN_SATELLITES = 4;
export const MAX_HDOP = 5;

export type PoorFixReason = "satellites" | "hdop";

/** Why a fix is too poor to use, or null. A missing count or HDOP (undefined/NaN) is no reason. */
export function poorFixReason(sats: number | undefined, hdop: number | undefined): PoorFixReason | null {
  if (sats !== undefined && Number.isFinite(sats) && sats < MIN_SATELLITES) return "satellites";
  if (hdop !== undefined && Number.isFinite(hdop) && hdop > MAX_HDOP) return "hdop";
  return null;
}

export interface PoorFixCounts {
  satellites: number;
  hdop: number;
  /** NMEA: epochs whose RMC says valid but whose GGA says no satellite fix (dead reckoning, manual, simulation). */
  notSatelliteFix?: number;
}

export function poorFixTotal(c: PoorFixCounts): number {
  return c.satellites + c.hdop + (c.notSatelliteFix ?? 0);
}

function reasons(c: PoorFixCounts): string {
  return [
    c.satellites && `${c.satellites} with fewer than ${MIN_SATELLITES} satellites`,
    c.hdop && `${c.hdop} with HDOP above ${MAX_HDOP}`,
    c.notSatelliteFix && `${c.notSatelliteFix} marked by GGA as dead reckoning or no satellite fix`,
  ]
    .filter(Boolean)
    .join(", ");
}

/** One sentence for the session page's import notes, or null when nothing was dropped. */
export function poorFixNote(c: PoorFixCounts): string | null {
  const total = poorFixTotal(c);
  if (!total) return null;
  return `${total} poor GPS ${total === 1 ? "fix" : "fixes"} dropped: ${reasons(c)} (satellite minimum: a full fix needs four; HDOP limit: Lapbench default).`;
}

/** The refusal when every fix was too poor. */
export function allFixesPoorMessage(fileName: string, c: PoorFixCounts): string {
  return `"${fileName}" has no GPS fix good enough to use: all ${poorFixTotal(c)} fixes are poor (${reasons(c)}); at least ${MIN_SATELLITES} satellites and HDOP at most ${MAX_HDOP} are needed.`;
}
