"use client";
/**
 * Compare's series in the browser: GET /api/series as binary, decoded into typed-array views
 * (no per-sample objects), one React Query entry per request.
 */
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { decodeSeries, type SeriesArray } from "@/lib/series/binary";
import type { LapRef, LapSeriesMeta, SeriesX } from "@/lib/series/lap-series-meta";
import { lapSeriesSearch } from "@/lib/series/lap-series-query";
import { queryKeys } from "./query-keys";

export interface LapSeriesData {
  meta: LapSeriesMeta;
  arrays: SeriesArray[];
  /** The request, for a person (or a test) to fetch the same thing. */
  url: string;
  bytes: number;
}

/** Performance marks around the series, read by the Compare benchmark. */
export const MARK_SERIES_ARRIVED = "lapbench:series-arrived";

export async function fetchLapSeries(url: string): Promise<LapSeriesData> {
  const res = await fetch(url, { headers: { accept: "application/octet-stream" } });
  if (!res.ok) {
    const body = (await res.json().catch(() => null)) as { error?: string } | null;
    throw new Error(body?.error ?? `The series could not be read (HTTP ${res.status}).`);
  }
  const buf = await res.arrayBuffer();
  performance.mark(MARK_SERIES_ARRIVED);
  const { meta, arrays } = decodeSeries<LapSeriesMeta>(buf);
  return { meta, arrays, url, bytes: buf.byteLength };
}

/** The series of `laps` × `roles` on x for a chart `width` px wide (only `window` of x when given: zooming in fetches finer data for that stretch); idle until both are given. */
export function useLapSeries(laps: readonly LapRef[], roles: readonly string[], x: SeriesX, width: number, window: [number, number] | null = null, enabled = true) {
  const search = lapSeriesSearch(laps, roles, x, width, window);
  const url = `/api/series?${search}`;
  return useQuery({
    queryKey: queryKeys.lapSeries(search),
    queryFn: () => fetchLapSeries(url),
    enabled: enabled && laps.length > 0 && roles.length > 0 && width > 0,
    // Keep the charts showing the previous laps while the next set loads.
    placeholderData: keepPreviousData,
    staleTime: 5 * 60_000,
  });
}
