/**
 * The effect of each setup change between consecutive sessions of one bike at one track: the
 * fields that differ between the setup the earlier session ended on and the one the later session
 * ran, the best lap and best-three mean before and after, the conditions of each, and the sectors
 * whose best time moved most. A pair is listed only when the setup changed.
 * It shows what happened, not why: track temperature, tyres, fuel and the rider move lap times too.
 */
export interface EffectSession {
  sessionId: number;
  title: string;
  startedAt: string | null;
  bikeId: number | null;
  trackId: number | null;
  conditions: string | null;
  setupVersion: number | null;
  setup: Record<string, number | string | null> | null;
  bestLapMs: number | null;
  bestThreeMeanMs: number | null;
  bestSectorsMs: number[] | null;
}

export interface SectorMove {
  /** 1-based sector number. */
  sector: number;
  beforeMs: number;
  afterMs: number;
  deltaMs: number;
}

export interface SetupEffect {
  bikeId: number;
  trackId: number;
  before: EffectSession;
  after: EffectSession;
  changes: { field: string; before: number | string | null; after: number | string | null }[];
  bestLapDeltaMs: number | null;
  bestThreeMeanDeltaMs: number | null;
  /** Sectors ordered by how far their best time moved (largest first), at most `maxSectors`. */
  sectors: SectorMove[];
}

export function setupEffects(sessions: readonly EffectSession[], fieldOrder: readonly string[], maxSectors = 3): SetupEffect[] {
  const groups = new Map<string, EffectSession[]>();
  for (const s of sessions) {
    if (s.bikeId == null || s.trackId == null || !s.setup) continue;
    const key = `${s.bikeId}|${s.trackId}`;
    const list = groups.get(key) ?? [];
    list.push(s);
    groups.set(key, list);
  }
  const out: SetupEffect[] = [];
  for (const list of groups.values()) {
    list.sort((a, b) => (a.startedAt ?? "").localeCompare(b.startedAt ?? "") || a.sessionId - b.sessionId);
    for (let i = 1; i < list.length; i++) {
      const before = list[i - 1]!;
      const after = list[i]!;
      const changes = fieldOrder
        .filter((f) => (before.setup![f]! ?? null) !== (after.setup![f]! ?? null))
        .map((f) => ({ field: f, before: before.setup![f]! ?? null, after: after.setup![f]! ?? null }));
      if (changes.length === 0) continue;
      const sectors: SectorMove[] = [];
      if (before.bestSectorsMs && after.bestSectorsMs && before.bestSectorsMs.length === after.bestSectorsMs.length) {
        before.bestSectorsMs.forEach((b, k) => sectors.push({ sector: k + 1, beforeMs: b, afterMs: after.bestSectorsMs![k]!, deltaMs: after.bestSectorsMs![k]! - b }));
        sectors.sort((x, y) => Math.abs(y.deltaMs) - Math.abs(x.deltaMs) || x.sector - y.sector);
      }
      const delta = (a: number | null, b: number | null) => (a == null || b == null ? null : b - a);
      out.push({
        bikeId: after.bikeId!,
        trackId: after.trackId!,
        before,
        after,
        changes,
        bestLapDeltaMs: delta(before.bestLapMs, after.bestLapMs),
        bestThreeMeanDeltaMs: delta(before.bestThreeMeanMs, after.bestThreeMeanMs),
        sectors: sectors.slice(0, maxSectors),
      });
    }
  }
  return out.sort((a, b) => (b.after.startedAt ?? "").localeCompare(a.after.startedAt ?? ""));
}
