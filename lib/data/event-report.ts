import "server-only";
/**
 * One event's report: best laps per rider and bike, the sessions, findings open and acknowledged,
 * and each engine's use at the event beside its life since the rebuild. Shown as a printable page
 * and mailed to the team owner after the event.
 */
import { createElement } from "react";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, RaceEvent, Track } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { forbidden, notFound } from "@/lib/http/http-error";
import { config } from "@/lib/config";
import { bestPerPair } from "@/lib/record/best-per-pair";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { deliverMail } from "@/lib/mail/deliver";
import { EventReportMail } from "@/components/mail/event-report-mail";
import { lapsOfSessions, seasonBaseRows, toSeasonRow, type SeasonRow } from "./season-record";
import { listSeasonEngines } from "./engine-season";
import { jsonColumn } from "./json-column";

export interface EventReport {
  id: number;
  name: string;
  startsOn: string | null;
  endsOn: string | null;
  trackName: string | null;
  rows: SeasonRow[];
  bestLaps: SeasonRow[];
  findings: { open: number; acknowledged: number };
  engines: { id: number; serial: string; hours: number; km: number; overRevs: number; usedPct: number | null }[];
}

export function eventDates(r: Pick<EventReport, "startsOn" | "endsOn">): string {
  if (!r.startsOn) return "No dates";
  return r.endsOn && r.endsOn !== r.startsOn ? `${r.startsOn} – ${r.endsOn}` : r.startsOn;
}

export async function getEventReport(ctx: TeamContext, eventId: number): Promise<EventReport> {
  initModels();
  const event = await RaceEvent.findOne({ where: { id: eventId, teamId: ctx.teamId } });
  if (!event) throw notFound("Event");
  const track = event.trackId ? await Track.findOne({ where: { id: event.trackId, teamId: ctx.teamId }, attributes: ["name"] }) : null;
  const base = await seasonBaseRows(ctx, "AND rs.event_id = ?", [eventId]);
  const laps = await lapsOfSessions(base.map((r) => r.sessionId));
  const rows = base.map((r) => toSeasonRow(r, laps.get(r.sessionId) ?? []));
  const findings = { open: rows.reduce((a, r) => a + r.findingsOpen, 0), acknowledged: rows.reduce((a, r) => a + r.findingsAcknowledged, 0) };
  const engines: EventReport["engines"] = [];
  if (ctx.role !== "rider" && rows.length) {
    const use = await getSequelize().query<{ engineId: number; summary: unknown }>(
      `SELECT engine_id AS engineId, summary FROM ride_sessions WHERE team_id = ? AND event_id = ? AND status = 'ready' AND engine_id IS NOT NULL`,
      { replacements: [ctx.teamId, eventId], type: QueryTypes.SELECT },
    );
    const season = await listSeasonEngines(ctx);
    for (const u of use) {
      const e = season.find((x) => x.id === u.engineId);
      if (!e) continue;
      const stored = jsonColumn<{ engine?: { hours?: number; distanceM?: number; distanceKm?: number; ceilingExceedances?: number } }>(u.summary)?.engine;
      let row = engines.find((x) => x.id === e.id);
      if (!row) engines.push((row = { id: e.id, serial: e.serial, hours: 0, km: 0, overRevs: 0, usedPct: e.ledger.usedPct }));
      row.hours += stored?.hours ?? 0;
      row.km += stored?.distanceKm ?? (stored?.distanceM ?? 0) / 1000;
      row.overRevs += stored?.ceilingExceedances ?? 0;
    }
  }
  return { id: event.id, name: event.name, startsOn: event.startsOn, endsOn: event.endsOn, trackName: track?.name ?? null, rows, bestLaps: bestPerPair(rows), findings, engines };
}

/** Mail the report to the team's owners who want it; engineers and owners may send it. Returns the addresses. */
export async function sendEventReport(ctx: TeamContext, eventId: number): Promise<string[]> {
  if (ctx.role !== "owner" && ctx.role !== "engineer") throw forbidden("Only the owner and engineers send event reports.");
  const r = await getEventReport(ctx, eventId);
  const owners = await getSequelize().query<{ email: string }>(
    `SELECT u.email FROM member m JOIN user u ON u.id = m.userId LEFT JOIN mail_preferences mp ON mp.user_id = u.id
      WHERE m.organizationId = ? AND m.role = 'owner' AND COALESCE(mp.event_report, 1) = 1`,
    { replacements: [ctx.teamId], type: QueryTypes.SELECT },
  );
  const url = `${config.appUrl.replace(/\/$/, "")}/events/${r.id}/report`;
  const props = {
    teamName: ctx.teamName, eventName: r.name, dates: eventDates(r), trackName: r.trackName, url,
    bestLaps: r.bestLaps.map((b) => ({ rider: b.riderName ?? "—", bike: b.bikeName ?? "—", bestLap: formatLapTime(b.bestLapMs) || "—", bestThreeMean: formatLapTime(b.bestThreeMeanMs) || "—", session: b.title })),
    findings: r.findings,
    engines: r.engines.map((e) => ({ serial: e.serial, hours: e.hours.toFixed(2), km: e.km.toFixed(0), overRevs: e.overRevs, usedPct: e.usedPct == null ? null : `${e.usedPct.toFixed(0)} %` })),
  };
  for (const o of owners) await deliverMail(o.email, `Event report: ${r.name}`, createElement(EventReportMail, props));
  return owners.map((o) => o.email);
}
