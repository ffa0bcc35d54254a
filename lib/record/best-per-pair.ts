/**
 * Per rider and bike, the row with the quickest best lap (ties: the earlier session). Used for
 * "best lap ever at this track"; rows without a best lap are skipped.
 */
export interface PairRow {
  riderId: number | null;
  bikeId: number | null;
  bestLapMs: number | null;
  startedAt: string | null;
  sessionId: number;
}

export function bestPerPair<T extends PairRow>(rows: readonly T[]): T[] {
  const best = new Map<string, T>();
  for (const r of rows) {
    if (r.bestLapMs == null) continue;
    const key = `${r.riderId ?? "-"}|${r.bikeId ?? "-"}`;
    const cur = best.get(key);
    if (!cur || r.bestLapMs < cur.bestLapMs! || (r.bestLapMs === cur.bestLapMs && (r.startedAt ?? "") < (cur.startedAt ?? ""))) best.set(key, r);
  }
  return [...best.values()].sort((a, b) => a.bestLapMs! - b.bestLapMs!);
}
