/**
 * A first upload from a logger Lapbench has not seen, as the demo engineer does it in Chromium
 * against the production build, without touching the database: semicolon, decimal comma, time in
 * ms, short names with a trailing F/R, sparse GPS on a circuit far from any of the team's tracks
 * (tests/fixtures/foreign-logger.ts, written from our own generator). Mapping suggested → the one
 * wrong role fixed → the Import profile edited → the session mapped again → the track suggested
 * and its start/finish gate confirmed → laps shown; Compare then opens on two laps by itself.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { foreignLoggerCsv } from "../fixtures/foreign-logger";

const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
const FILE = path.resolve(__dirname, "../../test-output/fieldbox-day1.csv");

let browser: Browser;
let ctx: BrowserContext;
let page: Page;
let sessionId = 0;
const log = foreignLoggerCsv({ seed: 29, flyingLaps: 3 });

beforeAll(async () => {
  fs.mkdirSync(path.dirname(FILE), { recursive: true });
  fs.writeFileSync(FILE, log.text);
  browser = await launch();
  ctx = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error") console.log(`[browser error] ${m.text()}`);
  });
  await signIn(page, engineer.email, DEMO_PASSWORD);
});
afterAll(async () => {
  await browser?.close();
});

async function waitReady() {
  await page.locator('[data-testid="session-status"][data-status="ready"]').waitFor({ timeout: 120_000 });
}

describe("a log from a new logger, from upload to laps", () => {
  it("1. the mapping is suggested from names, units and values, with a reason per column", async () => {
    await page.goto(`${appUrl()}/upload`);
    await page.locator('[data-testid="dropzone"][data-ready="true"]').waitFor({ timeout: 30_000 });
    await page.getByTestId("dropzone-input").setInputFiles(FILE);
    await page.waitForURL(/\/sessions\/\d+\/import$/, { timeout: 60_000 });
    sessionId = Number(/\/sessions\/(\d+)\/import$/.exec(page.url())![1]);
    await page.getByTestId("mapping-table").waitFor();
    expect(await page.getByTestId("file-facts").textContent()).toMatch(/semicolon-separated, decimal comma/);
    const expected: Record<string, string> = { "Spd F": "speed_front", "Spd R": "speed_rear", nEng: "engine_rpm", Thr: "throttle", "Prs F": "brake_front", "Prs R": "brake_rear", "Pos F": "fork_travel", Gr: "gear", Lat: "gps_lat", Lon: "gps_lon", "Pot 3": "other" };
    for (const [name, role] of Object.entries(expected)) expect(await page.getByLabel(`Role of ${name}`).inputValue(), name).toBe(role);
    expect(await page.getByLabel("Time column is written in").inputValue()).toBe("milliseconds");
    expect(await page.getByTestId("mapping-table").textContent()).toMatch(/a pressure channel is usually brake pressure/);
    await shot(page, "foreign-mapping-suggested");
  });

  it("2. the wrong role is fixed and the file is read; the event's far-away track is not used, and the page says how far", async () => {
    await page.getByLabel("Role of Pot 3").selectOption("shock_travel");
    expect(await page.getByLabel("Unit of Pot 3").inputValue()).toBe("mm");
    await page.getByLabel("Title", { exact: true }).fill("Test day — bike with the other logger");
    await page.getByLabel("Event", { exact: true }).selectOption({ label: "Spring test days (2031-05-17)" });
    await page.getByRole("button", { name: "Save and import" }).click();
    await page.waitForURL(new RegExp(`/sessions/${sessionId}$`), { timeout: 30_000 });
    await waitReady();
    const refused = page.getByTestId("track-refused");
    await refused.waitFor({ timeout: 30_000 });
    expect(await refused.textContent()).toMatch(/Not put on .+\(the event's track\): this log's positions are [\d,]+ km from it/);
    expect(await page.getByTestId("laps-empty").count()).toBe(1);
    await shot(page, "foreign-session-track-refused");
  });

  it("3. the Import profile is edited: renamed, the battery column left out", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Import profiles" }).click();
    await page.waitForURL(/\/import-profiles$/);
    const named = page.getByTestId("import-profile").filter({ hasText: "Fieldbox 12 (invented)" });
    await named.waitFor();
    const card = page.locator(`[data-testid="import-profile"][data-profile-id="${await named.getAttribute("data-profile-id")}"]`);
    expect(await card.textContent()).toMatch(/read 1 session/);
    await card.getByLabel("Name", { exact: true }).fill("Fieldbox 12");
    await card.getByLabel("Role of Batt").selectOption("ignore");
    await card.getByRole("button", { name: "Save profile" }).click();
    await card.getByText("Profile saved.").waitFor({ timeout: 30_000 });
    // The form still shows what was saved (not reset to the first choices).
    expect(await card.getByLabel("Role of Batt").inputValue()).toBe("ignore");
    expect(await card.getByLabel("Role of Spd F").inputValue()).toBe("speed_front");
    expect(await card.getByLabel("Time column is written in").inputValue()).toBe("milliseconds");
    await shot(page, "foreign-import-profiles");
  });

  it("4. the session is mapped again from its page, starting from the edited profile", async () => {
    await page.goto(`${appUrl()}/sessions/${sessionId}`);
    await page.getByTestId("map-again").getByRole("button", { name: "Map again" }).click();
    await page.waitForURL(new RegExp(`/sessions/${sessionId}/import$`), { timeout: 30_000 });
    await page.getByTestId("update-profile").waitFor();
    expect(await page.getByLabel("Role of Batt").inputValue()).toBe("ignore");
    expect(await page.getByLabel("Role of Pot 3").inputValue()).toBe("shock_travel");
    await shot(page, "foreign-map-again");
    await page.getByRole("button", { name: "Save and read the file again" }).click();
    await page.waitForURL(new RegExp(`/sessions/${sessionId}$`), { timeout: 30_000 });
    await waitReady();
    const channels = await page.getByTestId("channel-table").textContent();
    expect(channels).toMatch(/Shock travel/);
    expect(channels).not.toMatch(/Batt/);
  });

  it("5–6. a track is suggested with a start/finish gate; confirming it shows the laps", async () => {
    const suggestion = page.getByTestId("gate-suggestion");
    await suggestion.waitFor({ timeout: 30_000 });
    expect(await suggestion.textContent()).toMatch(/in the middle of the longest straight \(\d+ m\)/);
    await page.getByTestId("suggested-gate-map").waitFor();
    await shot(page, "foreign-gate-suggested");
    await page.getByLabel("Track name").fill("Fieldbox test circuit");
    await page.getByRole("button", { name: "Confirm gate and split laps" }).click();
    await page.getByText(/Track made; the session has \d+ laps\./).waitFor({ timeout: 60_000 });
    const table = page.getByTestId("lap-table");
    await table.waitFor({ timeout: 30_000 });
    const truth = log.session.truth.laps.filter((l) => l.kind === "flying");
    // Each flying lap of the generator's ground truth is listed within 0.1 s (the gate sits ~70 m before its line).
    const shown = (await table.locator('tr[data-testid^="lap-row-"] td:nth-child(3)').allTextContents()).map((t) => {
      const m = /(\d+):(\d{2})\.(\d{3})/.exec(t);
      return m ? Number(m[1]) * 60000 + Number(m[2]) * 1000 + Number(m[3]) : NaN;
    });
    for (const l of truth) expect(shown.some((ms) => Math.abs(ms - l.lapTimeMs) < 100), `${l.lapTimeMs} ms among ${shown.join(", ")}`).toBe(true);
    expect(await page.getByTestId("session-track").textContent()).toMatch(/On Fieldbox test circuit/);
    await shot(page, "foreign-laps");
  });

  it("Compare opens on two laps by itself", async () => {
    await page.goto(`${appUrl()}/compare`);
    await page.waitForURL(/\/compare\?laps=\d+:\d+,\d+:\d+$/, { timeout: 30_000 });
    await page.waitForTimeout(1500);
    await shot(page, "foreign-compare-default");
  });
});
