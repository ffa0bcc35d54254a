"use client";
/** The team's sessions and a session's laps, for Compare's lap picker. */
import { useQuery } from "@tanstack/react-query";
import { queryKeys } from "./query-keys";

export interface PickerSession {
  id: number;
  title: string;
  status: string;
  riderName: string | null;
  startedAt: string | null;
}

export interface PickerLap {
  sessionId: number;
  number: number;
  lapTimeMs: number;
  outLap: boolean;
  inLap: boolean;
  pitPass: boolean;
  invalid: boolean;
}

async function getJson<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as (T & { error?: string }) | null;
  if (!res.ok || !body) throw new Error(body?.error ?? `HTTP ${res.status}`);
  return body;
}

export function useTeamSessions(initial?: PickerSession[]) {
  return useQuery({
    queryKey: queryKeys.teamSessions(),
    queryFn: async () => (await getJson<{ sessions: PickerSession[] }>("/api/sessions?limit=100")).sessions,
    initialData: initial,
  });
}

export function useSessionLaps(sessionId: number | null) {
  return useQuery({
    queryKey: queryKeys.sessionLaps(sessionId ?? 0),
    queryFn: async () => (await getJson<{ laps: PickerLap[] }>(`/api/sessions/${sessionId}/laps`)).laps,
    enabled: sessionId != null,
    staleTime: 60_000,
  });
}
