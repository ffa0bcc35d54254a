/**
 * The one rule for the two lap states kept in a lap row's `stats` JSON rather than a column of
 * their own: "complete" (the lap starts and ends on a line crossing) and "suspect" (markSuspectLaps).
 * Rows written before those keys existed have neither: only the out-lap and the in-lap can be cut
 * off by the log's ends, so a lap is complete unless it is one of those, and not suspect.
 */
export function storedLapState(stats: { complete?: unknown; suspect?: unknown } | null | undefined, outLap: boolean, inLap: boolean): { complete: boolean; suspect: boolean } {
  return {
    complete: typeof stats?.complete === "boolean" ? stats.complete : !outLap && !inLap,
    suspect: stats?.suspect === true,
  };
}
