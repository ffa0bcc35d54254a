/**
 * "Session ready" mail, sent once per session and person when the ingest job has marked a session
 * ready: the session's rider gets their brief summary and a link to the Rider brief; the team's
 * engineers get the figures and the findings count. Each person can turn it off on their settings
 * page. It never throws: a mail service that is down must not fail or delay an import's outcome.
 */
import { QueryTypes, type Sequelize } from "sequelize";
import { config } from "../config";
import { lapFigures, type RecordLap } from "../record/lap-figures";
import { storedLapState } from "../laps/stored-lap-state";
import { formatLapTime } from "../export/format-lap-time";
import { storedJsonParse } from "../analysis/stored-json";
import type { SessionReadyMailProps } from "../../components/mail/session-ready-mail";

interface SessionRow {
  id: number;
  teamId: string;
  teamName: string;
  title: string | null;
  status: string;
  riderUserId: string | null;
  riderName: string | null;
  bikeName: string | null;
}

export interface SessionReadyOutcome {
  sent: { to: string; audience: "rider" | "engineer" }[];
  skipped: string[];
  errors: string[];
}

/** The brief's plain sentences, the largest braking differences first (at most three). */
function briefLines(raw: string | undefined): string[] {
  if (!raw) return [];
  try {
    const brief = storedJsonParse<{ available?: boolean; corners?: { text: string; earlierM: number | null }[] }>(raw);
    if (!brief.available || !brief.corners) return [];
    return [...brief.corners]
      .filter((c) => c.text)
      .sort((a, b) => Math.abs(b.earlierM ?? 0) - Math.abs(a.earlierM ?? 0))
      .slice(0, 3)
      .map((c) => c.text);
  } catch {
    return [];
  }
}

async function loadMailer() {
  const [{ createElement }, { SessionReadyMail }, { deliverMail }] = await Promise.all([import("react"), import("../../components/mail/session-ready-mail"), import("./deliver")]);
  return (to: string, subject: string, props: SessionReadyMailProps) => deliverMail(to, subject, createElement(SessionReadyMail, props));
}

export async function notifySessionReady(sequelize: Sequelize, sessionId: number): Promise<SessionReadyOutcome> {
  const out: SessionReadyOutcome = { sent: [], skipped: [], errors: [] };
  try {
    const [s] = await sequelize.query<SessionRow>(
      `SELECT rs.id, rs.team_id AS teamId, o.name AS teamName, rs.title, rs.status, r.user_id AS riderUserId, r.name AS riderName, b.name AS bikeName
         FROM ride_sessions rs JOIN organization o ON o.id = rs.team_id
         LEFT JOIN riders r ON r.id = rs.rider_id LEFT JOIN bikes b ON b.id = rs.bike_id WHERE rs.id = ?`,
      { replacements: [sessionId], type: QueryTypes.SELECT },
    );
    if (!s || s.status !== "ready") return out;
    const [laps, findings, parts, people] = await Promise.all([
      sequelize.query<{ number: number; lapTimeMs: number; isOutLap: number; isInLap: number; isInvalid: number; pitPass: number; topSpeedMps: number | null; stats: unknown }>(
        "SELECT number, lap_time_ms AS lapTimeMs, is_out_lap AS isOutLap, is_in_lap AS isInLap, is_invalid AS isInvalid, pit_pass AS pitPass, top_speed_mps AS topSpeedMps, stats FROM laps WHERE session_id = ?",
        { replacements: [sessionId], type: QueryTypes.SELECT },
      ),
      sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM findings WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT }),
      sequelize.query<{ data: string }>("SELECT data FROM session_analysis_parts WHERE session_id = ? AND part = 'brief'", { replacements: [sessionId], type: QueryTypes.SELECT }),
      // The rider (by the rider's linked user) and the engineers, each with their choice.
      sequelize.query<{ userId: string; email: string; audience: "rider" | "engineer"; wants: number; already: number }>(
        `SELECT u.id AS userId, u.email, x.audience, COALESCE(mp.session_ready, 1) AS wants,
                EXISTS (SELECT 1 FROM mail_sent ms WHERE ms.kind = 'session_ready' AND ms.ref_id = ? AND ms.user_id = u.id) AS already
           FROM (SELECT ? AS userId, 'rider' AS audience FROM DUAL WHERE ? IS NOT NULL
                 UNION SELECT m.userId, 'engineer' FROM member m WHERE m.organizationId = ? AND m.role = 'engineer') x
           JOIN user u ON u.id = x.userId
           JOIN member mm ON mm.userId = u.id AND mm.organizationId = ?
           LEFT JOIN mail_preferences mp ON mp.user_id = u.id`,
        { replacements: [sessionId, s.riderUserId, s.riderUserId, s.teamId, s.teamId], type: QueryTypes.SELECT },
      ),
    ]);
    const f = lapFigures(
      laps.map(({ stats, ...l }): RecordLap => {
        const state = storedLapState((typeof stats === "string" ? JSON.parse(stats) : stats) as { complete?: boolean; suspect?: boolean } | null, !!l.isOutLap, !!l.isInLap);
        return { ...l, isOutLap: !!l.isOutLap, isInLap: !!l.isInLap, isInvalid: !!l.isInvalid, pitPass: !!l.pitPass, ...state };
      }),
    );
    const base = config.appUrl.replace(/\/$/, "");
    const title = s.title ?? `Session ${s.id}`;
    const common: Omit<SessionReadyMailProps, "audience" | "url" | "briefLines"> = {
      teamName: s.teamName, sessionTitle: title, riderName: s.riderName, bikeName: s.bikeName,
      bestLap: f.bestLapMs == null ? null : formatLapTime(f.bestLapMs), bestThreeMean: f.bestThreeMeanMs == null ? null : formatLapTime(f.bestThreeMeanMs),
      flyingLaps: f.flyingLapCount, topSpeed: f.topSpeedMps == null ? null : `${(f.topSpeedMps * 3.6).toFixed(1)} km/h`,
      findingsCount: Number(findings[0]?.n ?? 0), settingsUrl: `${base}/settings`,
    };
    const lines = briefLines(parts[0]?.data);
    // Loaded only when there is mail to send: the e-mail components are large, and the ingest worker
    // process starts without them.
    const send = people.some((p) => Number(p.wants) && !Number(p.already)) ? await loadMailer() : null;
    for (const p of people) {
      if (!Number(p.wants) || Number(p.already)) {
        out.skipped.push(p.email);
        continue;
      }
      try {
        const url = p.audience === "rider" ? `${base}/sessions/${s.id}/brief` : `${base}/sessions/${s.id}`;
        const subject = p.audience === "rider" ? `${title} is ready: your brief` : `${title} is ready: ${common.findingsCount} ${common.findingsCount === 1 ? "finding" : "findings"}`;
        await send!(p.email, subject, { ...common, audience: p.audience, url, briefLines: p.audience === "rider" ? lines : [] });
        await sequelize.query("INSERT IGNORE INTO mail_sent (kind, ref_id, user_id) VALUES ('session_ready', ?, ?)", { replacements: [s.id, p.userId], type: QueryTypes.INSERT });
        out.sent.push({ to: p.email, audience: p.audience });
      } catch (e) {
        out.errors.push(`${p.email}: ${e instanceof Error ? e.message : String(e)}`);
      }
    }
  } catch (e) {
    out.errors.push(e instanceof Error ? e.message : String(e));
  }
  if (out.errors.length) console.log(`[mail] session ${sessionId}: "session ready" not sent to all: ${out.errors.join("; ")}`);
  return out;
}
