"use client";
/** A session's import status from GET /api/sessions/:id, polled while it is still being read. */
import { useState } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { queryKeys } from "./query-keys";

export interface SessionStatus {
  id: number;
  status: string;
  progress: number;
  statusReason: string | null;
}

/** Statuses after which nothing changes without a person acting: polling stops there. */
export const SETTLED_STATUSES: ReadonlySet<string> = new Set(["ready", "failed", "mapping"]);

/** One second is quick enough to look live and cheap for one small row read. */
const POLL_MS = 1000;

async function fetchSessionStatus(id: number): Promise<SessionStatus> {
  const res = await fetch(`/api/sessions/${id}`, { headers: { accept: "application/json" }, cache: "no-store" });
  const body = (await res.json().catch(() => null)) as { session?: SessionStatus; error?: string } | null;
  if (!res.ok || !body?.session) throw new Error(body?.error ?? `The session could not be read (HTTP ${res.status}).`);
  const { status, progress, statusReason } = body.session;
  return { id, status, progress, statusReason };
}

export function useSessionStatus(id: number, initial?: SessionStatus) {
  // The server read the initial status just now; stamp it once, not on every render.
  const [initialAt] = useState(() => (initial ? Date.now() : undefined));
  const qc = useQueryClient();
  // The page was just rendered on the server: its status is newer than anything cached from an
  // earlier visit (a session mapped again was "ready" then and is "queued" now). Once, on mount.
  useState(() => {
    if (initial) qc.setQueryData(queryKeys.session(id), initial);
    return null;
  });
  return useQuery({
    queryKey: queryKeys.session(id),
    queryFn: () => fetchSessionStatus(id),
    initialData: initial,
    initialDataUpdatedAt: initialAt,
    refetchInterval: (q) => (q.state.data && SETTLED_STATUSES.has(q.state.data.status) ? false : POLL_MS),
    // Keep polling in a background tab: the engineer switches to the next bike's data meanwhile.
    refetchIntervalInBackground: true,
  });
}
