/** React Query keys, built in one place so a refetch or invalidation hits the right cache entry. */
export const queryKeys = {
  session: (id: number) => ["session", id] as const,
  teamSessions: () => ["team-sessions"] as const,
  sessionLaps: (id: number) => ["session-laps", id] as const,
  lapSeries: (search: string) => ["lap-series", search] as const,
};
