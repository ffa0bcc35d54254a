/**
 * Log ingest as the demo engineer does it, in Chromium against the production build: open Upload,
 * drop a logger export, watch the upload progress, map the columns (first time this layout is seen
 * in this database), watch the session being read, see the channels in display units; then a file
 * with a bad cell fails with its line and column, a photo is refused, and a viewer has no Upload.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import path from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";

const ROOT = path.resolve(__dirname, "../..");
const THREE_LAPS = path.join(ROOT, "sample-logs/files/three-laps-20hz.csv");
const BAD_CELL = path.join(ROOT, "tests/fixtures/hostile/non-numeric-cell.csv");
const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
const viewer = DEMO_USERS.find((u) => u.role === "viewer")!;

let browser: Browser;
let ctx: BrowserContext;
let page: Page;

beforeAll(async () => {
  browser = await launch();
  ctx = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error" || m.type() === "warning") console.log(`[browser ${m.type()}] ${m.text()}`);
  });
  await signIn(page, engineer.email, DEMO_PASSWORD);
});
afterAll(async () => {
  await browser?.close();
});

/** Every value the upload progress bar shows, recorded in the page and reported out (survives navigation). */
const progressSeen: number[] = [];
async function recordUploadProgress() {
  await page.exposeFunction("__reportUploadProgress", (v: number) => progressSeen.push(v));
  await page.addInitScript(() => {
    new MutationObserver((records) => {
      for (const r of records) {
        const el = r.target as Element;
        if (el.getAttribute?.("role") === "progressbar" && el.getAttribute("aria-label")?.startsWith("Upload of"))
          (window as unknown as { __reportUploadProgress(v: number): void }).__reportUploadProgress(Number(el.getAttribute("aria-valuenow")));
      }
    }).observe(document, { subtree: true, attributes: true, attributeFilter: ["aria-valuenow"] });
  });
}

/** Drop a file on the drop zone and wait until the app has moved on to its session. */
/** The drop zone listens once React has hydrated it. */
async function zoneReady() {
  await page.locator('[data-testid="dropzone"][data-ready="true"]').waitFor({ timeout: 30_000 });
}

async function dropAndFollow(file: string): Promise<{ sessionId: number; mapping: boolean }> {
  await zoneReady();
  await page.getByTestId("dropzone-input").setInputFiles(file);
  await page.waitForURL(/\/sessions\/\d+(\/import)?$/, { timeout: 60_000 });
  const m = /\/sessions\/(\d+)(\/import)?$/.exec(page.url())!;
  return { sessionId: Number(m[1]), mapping: !!m[2] };
}

let mappingChecked = false;

/**
 * The mapping screen, the first time one is reached in this run: the file's facts, the suggested
 * roles and units, and a mistake (one role on two columns) reported beside the column.
 */
async function checkMappingScreen(fileName: string, speedColumn: string, otherColumn: { name: string; role: string; unit: string }) {
  await page.getByTestId("mapping-table").waitFor();
  expect(await page.getByTestId("file-facts").textContent()).toContain(fileName);
  expect(await page.getByLabel(`Role of ${speedColumn}`).inputValue()).toBe("speed_front");
  expect(await page.getByLabel(`Unit of ${speedColumn}`).inputValue()).toBe("km/h");
  expect(await page.getByLabel("Role of Time").inputValue()).toBe("time");
  if (mappingChecked) return;
  mappingChecked = true;
  await shot(page, "import-mapping");
  await page.getByLabel(`Role of ${otherColumn.name}`).selectOption("speed_front");
  await page.getByRole("button", { name: "Save and import" }).click();
  await page.getByText("Already used by column 2; a role can be used once").waitFor();
  await shot(page, "import-mapping-error");
  await page.getByLabel(`Role of ${otherColumn.name}`).selectOption(otherColumn.role);
  await page.getByLabel(`Unit of ${otherColumn.name}`).selectOption(otherColumn.unit);
}

async function confirmMapping(title: string) {
  await page.getByLabel("Title", { exact: true }).fill(title);
  await page.getByLabel("Kind", { exact: true }).selectOption("practice");
  await page.getByLabel("Event", { exact: true }).selectOption({ index: 1 });
  await page.getByLabel("Rider", { exact: true }).selectOption({ index: 1 });
  await page.getByLabel("Bike", { exact: true }).selectOption({ index: 1 });
  await page.getByRole("button", { name: "Save and import" }).click();
  await page.waitForURL(/\/sessions\/\d+$/, { timeout: 30_000 });
}

describe("upload → mapping → ready", () => {
  it("the engineer sees Upload in the navigation, with the formats and limits stated", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Upload" }).click();
    await page.waitForURL(/\/upload$/);
    const formats = await page.getByTestId("formats").textContent();
    expect(formats).toMatch(/CSV/);
    expect(formats).toMatch(/GPX 1\.1/);
    expect(formats).toMatch(/NMEA 0183/);
    const limits = await page.getByTestId("limits").textContent();
    expect(limits).toMatch(/512 MB/);
    expect(limits).toMatch(/at most 512 columns/);
    await shot(page, "upload-empty");
  });

  it("drops the three-lap export, sees its progress, maps the columns and gets the channels in km/h", async () => {
    await recordUploadProgress();
    await page.reload();
    await zoneReady();
    const drop = page.getByTestId("dropzone-input").setInputFiles(THREE_LAPS);
    const bar = page.getByRole("progressbar", { name: "Upload of three-laps-20hz.csv" });
    const landed = page.waitForURL(/\/sessions\/\d+(\/import)?$/, { timeout: 60_000 });
    await Promise.race([bar.waitFor({ timeout: 30_000 }), landed]);
    if (await bar.isVisible()) await shot(page, "upload-progress");
    await drop;
    await landed;
    // The demo seed read these very bytes already: the app says so and offers a choice.
    if (!/\/import$/.test(page.url())) {
      const dup = page.getByTestId("duplicate-choice");
      await page.locator('[data-testid="duplicate-choice"], [data-testid="session-status"]').first().waitFor({ timeout: 30_000 });
      if (await dup.isVisible()) {
        expect(await dup.textContent()).toMatch(/This file was uploaded before/);
        await shot(page, "upload-duplicate-choice");
        // Go to the session the seed read from these bytes (importing it again is covered in tests/integration/foreign-log.test.ts).
        const held = page.url();
        await dup.getByRole("button", { name: "Go to the existing session" }).click();
        await page.waitForURL((u) => u.toString() !== held && /\/sessions\/\d+$/.test(u.pathname), { timeout: 30_000, waitUntil: "commit" });
      }
    }
    // The bar moved: it rose to 100% (the bytes are stored) before the app moved on.
    expect(progressSeen.length).toBeGreaterThan(0);
    expect(Math.max(...progressSeen)).toBe(100);
    const m = /\/sessions\/(\d+)(\/import)?$/.exec(page.url())!;
    const sessionId = Number(m[1]);

    // The demo seed may already hold an Import profile for this layout; then there is no mapping step.
    if (m[2]) {
      await checkMappingScreen("three-laps-20hz.csv", "Front wheel speed", { name: "Rear wheel speed", role: "speed_rear", unit: "km/h" });
      expect(await page.getByTestId("file-metadata").textContent()).toMatch(/sample rate: 100 Hz/);
      // The started-at time comes from the file's metadata.
      expect(await page.getByLabel("Started at (UTC)").inputValue()).toBe("2031-05-17T10:02");
      await confirmMapping("Practice 1 — three laps");
    }
    expect(page.url()).toMatch(new RegExp(`/sessions/${sessionId}$`));

    // Queued or being read first (unless the worker was quicker than the page), then ready.
    const status = page.getByTestId("session-status");
    await status.waitFor().catch(async (e) => {
      await shot(page, "session-status-missing");
      throw e;
    });
    expect(["queued", "parsing", "ready"]).toContain(await status.getAttribute("data-status"));
    await shot(page, "session-reading");
    await page.locator('[data-testid="session-status"][data-status="ready"]').waitFor({ timeout: 120_000 });
    const table = page.getByTestId("channel-table");
    await table.waitFor({ timeout: 30_000 });
    const row = table.locator("tr", { hasText: "Front wheel speed" }).first();
    const cells = await row.locator("td").allTextContents();
    expect(cells[1]).toBe("Front wheel speed");
    expect(cells[2]).toBe("km/h");
    expect(Number(cells[6])).toBeGreaterThan(150); // a superbike's top speed, in km/h not m/s
    expect(await table.locator("tr", { hasText: "Fork travel" }).first().locator("td").nth(2).textContent()).toBe("mm");
    expect(await table.locator("tr", { hasText: "Front brake pressure" }).first().locator("td").nth(2).textContent()).toBe("bar");
    // Mapped here, the start time came from the file's metadata through the details form.
    if (m[2]) expect(await page.getByTestId("session-facts").textContent()).toMatch(/2031-05-17 10:02 UTC/);
    expect(await page.getByTestId("session-facts").textContent()).toMatch(/Duration\d+:\d{2}/);
    await shot(page, "session-ready");

    // Team home lists it and links to it.
    await page.goto(`${appUrl()}/home`);
    await page.getByTestId("sessions-table").locator(`a[href="/sessions/${sessionId}"]`).click();
    await page.waitForURL(new RegExp(`/sessions/${sessionId}$`));
  });

  it("a file with a bad cell fails with the line and the column, and offers a re-import", async () => {
    await page.goto(`${appUrl()}/upload`);
    const { mapping } = await dropAndFollow(BAD_CELL);
    if (mapping) {
      await checkMappingScreen("non-numeric-cell.csv", "Front wheel speed", { name: "Front brake", role: "brake_front", unit: "bar" });
      await confirmMapping("Bad cell test");
    }
    const failed = page.locator('[data-testid="session-status"][data-status="failed"]');
    await failed.waitFor({ timeout: 120_000 });
    const reason = await page.getByTestId("failure-reason").textContent();
    expect(reason).toMatch(/line 5\b/i);
    expect(reason).toMatch(/Front brake/);
    expect(reason).toMatch(/abc/);
    expect(await page.getByTestId("channel-table").count()).toBe(0);
    await page.getByRole("button", { name: "Re-import with another mapping" }).waitFor();
    await shot(page, "session-failed");

    // The stored file is read again and the mapping screen opens with it.
    await page.getByRole("button", { name: "Re-import with another mapping" }).click();
    await page.waitForURL(/\/sessions\/\d+\/import$/, { timeout: 30_000 });
    await page.getByTestId("mapping-table").waitFor();
  });

  it("a file that is not a log is refused with a specific message", async () => {
    await page.goto(`${appUrl()}/upload`);
    await zoneReady();
    await page.getByTestId("dropzone-input").setInputFiles({ name: "paddock.jpg", mimeType: "image/jpeg", buffer: Buffer.from([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3, 4]) });
    const item = page.locator('[data-testid="upload-item"][data-state="error"]');
    await item.waitFor({ timeout: 30_000 }).catch(async (e) => {
      await shot(page, "upload-refused-timeout");
      throw e;
    });
    expect(await item.getByRole("alert").textContent()).toMatch(/"paddock\.jpg" is not a log file.*\.csv/);
    expect(page.url()).toMatch(/\/upload$/);
    await shot(page, "upload-refused");
  });
});

describe("roles", () => {
  it("a viewer has no Upload entry and is sent to the not-allowed page", async () => {
    const vctx = await browser.newContext();
    const vp = await vctx.newPage();
    await signIn(vp, viewer.email, DEMO_PASSWORD);
    await vp.getByTestId("role").waitFor();
    const links = await vp.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();
    expect(links).toContain("Sessions");
    expect(links).not.toContain("Upload");
    await vp.goto(`${appUrl()}/upload`);
    await vp.waitForURL(/\/forbidden\?from=%2Fupload/);
    await vp.goto(`${appUrl()}/sessions`);
    await vp.getByRole("heading", { name: "Sessions" }).waitFor();
    await shot(vp, "sessions-viewer");
    await vctx.close();
  });
});
