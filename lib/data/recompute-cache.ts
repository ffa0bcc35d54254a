/**
 * Analyses recomputed on request for a setting a person chose (the Engine ledger's "time above"
 * rpm, the suspension low/high boundary, the slip lean correction) read a session's samples. To
 * keep a stream of such requests from tying up the server, the settings are restricted to a
 * finite set of values (roundRpm, roundBoundaryMs) and each result is kept in this process for a
 * while, keyed by everything it depends on (the session's analysis basis or update time), so a
 * repeat costs nothing and identical requests in flight share one computation.
 */
const MAX_ENTRIES = 64;
const TTL_MS = 15 * 60 * 1000;

interface Entry {
  at: number;
  value: Promise<unknown>;
}
const entries = new Map<string, Entry>();
let computations = 0;

export async function recomputeCached<T>(key: string, compute: () => Promise<T> | T): Promise<T> {
  const now = Date.now();
  const hit = entries.get(key);
  if (hit && now - hit.at < TTL_MS) {
    // Most recently used last.
    entries.delete(key);
    entries.set(key, hit);
    return hit.value as Promise<T>;
  }
  computations++;
  const value = Promise.resolve().then(compute);
  entries.set(key, { at: now, value });
  // A failure is not kept: the next request tries again.
  value.catch(() => {
    if (entries.get(key)?.value === value) entries.delete(key);
  });
  while (entries.size > MAX_ENTRIES) entries.delete(entries.keys().next().value as string);
  return value;
}

/** For tests: how many computations ran (cache misses) since the process started. */
export function recomputeCount(): number {
  return computations;
}

/** "Time above" rpm on the Engine ledger: 1 000–25 000 rpm in steps of 50 rpm. */
export function roundRpm(rpm: number): number {
  return Math.min(25_000, Math.max(1_000, Math.round(rpm / 50) * 50));
}

/** Suspension low/high speed boundary: 5–2 000 mm/s in whole mm/s (returned in m/s). */
export function roundBoundaryMs(boundaryMs: number): number {
  return Math.min(2_000, Math.max(5, Math.round(boundaryMs * 1000))) / 1000;
}
