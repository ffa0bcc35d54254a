/**
 * Every file of the hostile corpus through the real upload path (SDK → local upload service →
 * our route → import → worker), as an engineer would send it: each ends with a specific message a
 * person can act on (the same words the parser's unit test expects), the session shows failed or
 * waits on the mapping screen with the reason, the uploaded file is kept byte for byte, nothing
 * partial is visible, and the service keeps working for the next, good file.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { getSequelize } from "@/models/db";
import { initModels, RideSession, LogFile } from "@/models";
import { claimJob, finishJob, failJob } from "@/lib/data/jobs";
import { confirmMapping } from "@/lib/data/imports";
import { listChannels } from "@/lib/data/samples";
import { HttpError } from "@/lib/http/http-error";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import type { Mapping } from "@/lib/ingest/mapping";
import { CORPUS } from "../fixtures/hostile-corpus";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";

const DIR = path.resolve(__dirname, "../fixtures/hostile");
let team: TestTeam;
let up: UploadHarness;

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Hostile corpus team");
  up = await startUploadHarness();
});
afterAll(async () => {
  await up?.close();
});

/** Run this session's job the way the worker does; returns the session's final reason. */
async function runJobFor(sessionId: number): Promise<void> {
  const job = await claimJob(getSequelize(), `hostile-test-${sessionId}`, { sessionId });
  expect(job?.sessionId).toBe(sessionId);
  const r = await runIngestJob(getSequelize(), sessionId);
  if (r === "ready") await finishJob(getSequelize(), job!.id);
  else await failJob(getSequelize(), job!.id, "bad input");
}

describe("hostile corpus through the upload path", () => {
  it.each(CORPUS)("%s (%s)", async (file, _code, message) => {
    const bytes = fs.readFileSync(path.join(DIR, file));
    const { sessionId } = await up.upload(new File([bytes], file), team.members.engineer.cookie);
    let s = await RideSession.findByPk(sessionId);
    let reason: string | null = null;
    if (s?.status === "mapping") {
      // The person accepts the suggested mapping; a mapping that cannot work is refused right there.
      try {
        await confirmMapping(getSequelize(), team.teamId, sessionId, s.mapping as Mapping, "Corpus profile");
      } catch (e) {
        expect(e).toBeInstanceOf(HttpError);
        reason = (e as HttpError).message;
      }
      s = await RideSession.findByPk(sessionId);
    }
    if (s?.status === "queued") {
      await runJobFor(sessionId);
      s = await RideSession.findByPk(sessionId);
    }
    if (reason === null) {
      expect(s?.status).toBe("failed");
      reason = s!.statusReason;
    } else {
      expect(s?.status).toBe("mapping"); // nothing queued, the person fixes the mapping
    }
    // Same specific words as the parser reports, or (mapping refused) a reason naming the problem.
    if (s?.status === "failed") expect(reason).toMatch(message);
    else expect(reason).toMatch(/time/i);
    expect(await listChannels(getSequelize(), sessionId)).toEqual([]);
    const log = await LogFile.findByPk(s!.logFileId!);
    const stored = Buffer.from(await (await fetch(log!.url!)).arrayBuffer());
    expect(stored.equals(bytes)).toBe(true);
  });

  it("after the whole corpus the same path still reads a good file", async () => {
    const good = "Time [s],Throttle [%],Front wheel speed [km/h]\n0,0,0\n0.01,5,1\n0.02,10,2\n";
    const { sessionId } = await up.upload(new File([good], "after-corpus.csv"), team.members.engineer.cookie);
    let s = await RideSession.findByPk(sessionId);
    if (s?.status === "mapping") await confirmMapping(getSequelize(), team.teamId, sessionId, s.mapping as Mapping, "After corpus");
    await runJobFor(sessionId);
    s = await RideSession.findByPk(sessionId);
    expect(s?.status).toBe("ready");
    expect((await listChannels(getSequelize(), sessionId)).map((c) => c.role)).toEqual(["time", "throttle", "speed_front"]);
  });
});
