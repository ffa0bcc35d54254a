/**
 * The series request as URL query text, built and parsed in one place for the API route, the
 * browser hook and the Compare page's own URL: laps=12:3,12:5&roles=speed_front,throttle&x=distance.
 */
import { z } from "zod";
import { CHANNEL_ROLES, type ChannelRole } from "@/lib/channels/roles";
import type { LapRef, SeriesX } from "./lap-series-meta";

/** Laps one Compare request may hold (each lap is ~9 k samples per channel). */
export const MAX_COMPARE_LAPS = 8;
export const MAX_COMPARE_ROLES = 12;
const PLOTTABLE = CHANNEL_ROLES.filter((r) => r !== "time" && r !== "other") as Exclude<ChannelRole, "time" | "other">[];

export function formatLapRefs(laps: readonly LapRef[]): string {
  return laps.map((l) => `${l.sessionId}:${l.lap}`).join(",");
}

/** "12:3,12:5" → refs; entries that are not two positive integers are dropped. */
export function parseLapRefs(text: string | null | undefined): LapRef[] {
  if (!text) return [];
  const out: LapRef[] = [];
  for (const part of text.split(",")) {
    const m = /^\s*(\d{1,9}):(\d{1,5})\s*$/.exec(part);
    if (m) out.push({ sessionId: Number(m[1]), lap: Number(m[2]) });
  }
  return out;
}

export const lapSeriesQuerySchema = z.object({
  laps: z
    .string()
    .transform((s, ctx) => {
      const refs = parseLapRefs(s);
      if (refs.length === 0 || refs.length !== s.split(",").length) ctx.addIssue({ code: "custom", message: "laps must be sessionId:lap pairs separated by commas" });
      return refs;
    })
    .pipe(z.array(z.object({ sessionId: z.number().int().positive(), lap: z.number().int().nonnegative() })).min(1).max(MAX_COMPARE_LAPS)),
  roles: z
    .string()
    .transform((s) => s.split(",").map((r) => r.trim()).filter(Boolean))
    .pipe(z.array(z.enum(PLOTTABLE)).min(1).max(MAX_COMPARE_ROLES)),
  x: z.enum(["distance", "time"]).default("distance"),
  width: z.coerce.number().int().min(50).max(10_000).default(1200),
  /** Optional x window (SI: m or s): only this stretch, at full resolution before decimation. */
  from: z.coerce.number().finite().min(0).optional(),
  to: z.coerce.number().finite().positive().optional(),
}).refine((q) => (q.from == null) === (q.to == null) && (q.from == null || q.to! > q.from), { message: "from and to come together, with to > from", path: ["to"] });

export type LapSeriesQuery = z.infer<typeof lapSeriesQuerySchema>;

export function lapSeriesSearch(laps: readonly LapRef[], roles: readonly string[], x: SeriesX, width: number, window: [number, number] | null = null): string {
  const p = new URLSearchParams({ laps: formatLapRefs(laps), roles: roles.join(","), x, width: String(Math.round(width)) });
  if (window) {
    p.set("from", String(window[0]));
    p.set("to", String(window[1]));
  }
  return p.toString();
}
