/**
 * The progression across a season at one track: per event (in date order) the quickest best lap
 * and the quickest best-three mean among the rows given.
 */
export interface ProgressionRow {
  eventId: number | null;
  eventName: string | null;
  eventDate: string | null;
  bestLapMs: number | null;
  bestThreeMeanMs: number | null;
}

export interface ProgressionPoint {
  eventId: number;
  eventName: string;
  eventDate: string;
  bestLapMs: number | null;
  bestThreeMeanMs: number | null;
}

const min = (a: number | null, b: number | null) => (a == null ? b : b == null ? a : Math.min(a, b));

export function eventProgression(rows: readonly ProgressionRow[]): ProgressionPoint[] {
  const by = new Map<number, ProgressionPoint>();
  for (const r of rows) {
    if (r.eventId == null || !r.eventDate) continue;
    const p = by.get(r.eventId) ?? { eventId: r.eventId, eventName: r.eventName ?? `Event ${r.eventId}`, eventDate: r.eventDate, bestLapMs: null, bestThreeMeanMs: null };
    p.bestLapMs = min(p.bestLapMs, r.bestLapMs);
    p.bestThreeMeanMs = min(p.bestThreeMeanMs, r.bestThreeMeanMs);
    by.set(r.eventId, p);
  }
  return [...by.values()].sort((a, b) => a.eventDate.localeCompare(b.eventDate) || a.eventId - b.eventId);
}
