/**
 * The owner's team export through the real route handler: a zip streamed from archiver, read back
 * with Debian's unzip (an independent reader of the ZIP format), holding the README of columns,
 * sessions and laps in SI units, setup sheets, notes and findings as JSON and the original upload
 * byte for byte (its SHA-256 compared). Only the owner may export; others get 403.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import http from "node:http";
import Papa from "papaparse";
import { initModels, LogFile, Note, RideSession } from "@/models";
import { createTeamWithRoles, req, params, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import { at } from "../fixtures/at";

const route = await import("@/app/api/team/export/route");

let team: TestTeam;
let world: World;
let server: http.Server;
let dir: string;
const original = Buffer.from("# rider: invented\nTime [s],Front wheel speed [km/h]\n0,0\n0.01,1.5\n", "utf8");

beforeAll(async () => {
  initModels();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-export-"));
  // A stand-in file store on loopback (the upload service serves stored files by URL).
  server = http.createServer((rq, rs) => (rq.url === "/f/original.csv" ? rs.end(original) : ((rs.statusCode = 404), rs.end())));
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  const port = (server.address() as { port: number }).port;
  team = await createTeamWithRoles("Export team");
  world = await buildWorld(team, [
    { title: "=Exp FP", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [92_000, 91_500, 91_750], sectorsMs: [[30_000, 29_000, 33_000], [29_900, 28_900, 32_700], [30_000, 28_950, 32_800]], topSpeedsMs: [80, 81, 80.5], findings: { open: 1, acknowledged: 1 }, setup: [{ forkPreloadMm: 5 }, { forkPreloadMm: 6 }] },
  ]);
  const log = await LogFile.create({ teamId: team.teamId, uploadKey: `k-${Date.now()}`, name: "original.csv", bytes: original.length, sha256: null, contentType: "text/csv", url: `http://127.0.0.1:${port}/f/original.csv`, uploadedBy: team.members.engineer.userId });
  await RideSession.update({ logFileId: log.id }, { where: { id: world.sessions["=Exp FP"] } });
  await Note.create({ teamId: team.teamId, sessionId: at(world.sessions, "=Exp FP"), lapNumber: 2, authorId: team.members.rider.userId, text: "Front pushes in Turn 3" });
});
afterAll(() => {
  server?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const unzip = (zip: string, ...args: string[]) => execFileSync("unzip", [...args, zip], { maxBuffer: 64 << 20 });

describe("team export", () => {
  it("streams a zip with the README, CSVs in SI units, JSON and the original upload", async () => {
    const res = await route.GET(req("/api/team/export", team.members.owner.cookie), params({}));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/zip");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="lapbench-.*\.zip"/);
    // A stream, not a buffered body.
    expect(res.body).toBeInstanceOf(ReadableStream);
    const zip = path.join(dir, "export.zip");
    fs.writeFileSync(zip, Buffer.from(await res.arrayBuffer()));
    execFileSync("unzip", ["-tq", zip]); // integrity check of every entry's CRC
    const names = unzip(zip, "-Z1").toString().trim().split("\n").sort();
    const up = `uploads/${world.sessions["=Exp FP"]}-original.csv`;
    expect(names).toEqual(["README.md", "findings.json", "laps.csv", "notes.json", "sessions.csv", "setup-sheets.json", up].sort());

    const read = (name: string) => execFileSync("unzip", ["-p", zip, name], { maxBuffer: 64 << 20 });
    expect(createHash("sha256").update(read(up)).digest("hex")).toBe(createHash("sha256").update(original).digest("hex"));

    const readme = read("README.md").toString();
    for (const col of ["best_lap_s", "top_speed_m_per_s", "lap_time_s", "sector_times_s"]) expect(readme).toContain(`| ${col} |`);

    const sessions = Papa.parse<Record<string, string>>(read("sessions.csv").toString(), { header: true, skipEmptyLines: true }).data;
    expect(sessions).toHaveLength(1);
    // A title starting with "=" is written with a leading quote (OWASP CSV injection guidance).
    expect(at(sessions, 0).title).toBe("'=Exp FP");
    expect(at(sessions, 0).best_lap_s).toBe("91.5");
    expect(Number(at(sessions, 0).best_three_mean_s)).toBeCloseTo((92 + 91.5 + 91.75) / 3, 3);
    expect(at(sessions, 0).top_speed_m_per_s).toBe("81");
    expect(at(sessions, 0).setup_version).toBe("2");
    expect([at(sessions, 0).findings_open, at(sessions, 0).findings_acknowledged]).toEqual(["1", "1"]);
    expect(at(sessions, 0).original_file).toBe(up);

    const laps = Papa.parse<Record<string, string>>(read("laps.csv").toString(), { header: true, skipEmptyLines: true }).data;
    expect(laps.map((l) => l.lap_time_s)).toEqual(["92", "91.5", "91.75"]);
    expect(at(laps, 1).sector_times_s).toBe("29.9|28.9|32.7");
    expect(at(laps, 1).start_time_s).toBe("92");

    const setups = JSON.parse(read("setup-sheets.json").toString());
    expect(setups.map((s: { version: number; fields: { forkPreloadMm: number } }) => [s.version, s.fields.forkPreloadMm])).toEqual([[1, 5], [2, 6]]);
    expect(JSON.parse(read("notes.json").toString())[0]).toMatchObject({ lap: 2, text: "Front pushes in Turn 3", author: "rider" });
    expect(JSON.parse(read("findings.json").toString())).toHaveLength(2);
  });

  it("is the owner's alone", async () => {
    for (const role of ["engineer", "rider", "viewer"] as const) {
      const res = await route.GET(req("/api/team/export", team.members[role].cookie), params({}));
      expect(res.status).toBe(403);
    }
  });
});
