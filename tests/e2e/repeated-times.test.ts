/**
 * A CSV refused because rows repeat their time stamps (a 1 kHz log exported with times rounded
 * to 10 ms), as the demo engineer meets it in Chromium against the production build: the refusal
 * names the count and offers to keep the first row of each stamp; one click imports it, and the
 * session page says how many rows were dropped.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";

const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
const FILE = path.resolve(__dirname, "../../test-output/rounded-stamps-1khz.csv");

/** 2 000 rows at 1 kHz, times written to 10 ms: 200 stamps, 1 800 rows repeating the one before (by construction). */
function roundedCsv(): string {
  const lines = ["Elapsed [s],Wheel F [km/h],Lever F [bar]"];
  for (let i = 0; i < 2000; i++) lines.push(`${(Math.floor(i / 10) / 100).toFixed(2)},${(100 + (i % 50)).toFixed(1)},${i % 500 < 60 ? "9.0" : "0.0"}`);
  return lines.join("\n") + "\n";
}

let browser: Browser;
let page: Page;

beforeAll(async () => {
  fs.mkdirSync(path.dirname(FILE), { recursive: true });
  fs.writeFileSync(FILE, roundedCsv());
  browser = await launch();
  const ctx = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  page = await ctx.newPage();
  page.on("console", (m) => {
    if (m.type() === "error") console.log(`[browser error] ${m.text()}`);
  });
  await signIn(page, engineer.email, DEMO_PASSWORD);
});
afterAll(async () => {
  await browser?.close();
});

describe("rows repeating their time stamps", () => {
  let sessionId = 0;

  it("the refusal says how many rows repeat and offers to keep the first of each stamp", async () => {
    await page.goto(`${appUrl()}/upload`);
    await page.locator('[data-testid="dropzone"][data-ready="true"]').waitFor({ timeout: 30_000 });
    await page.getByTestId("dropzone-input").setInputFiles(FILE);
    await page.waitForURL(/\/sessions\/\d+\/import$/, { timeout: 60_000 });
    sessionId = Number(/\/sessions\/(\d+)\/import$/.exec(page.url())![1]);
    await page.getByTestId("mapping-table").waitFor();
    await page.getByLabel("Title", { exact: true }).fill("Rounded 1 kHz export");
    await page.getByRole("button", { name: "Save and import" }).click();
    await page.waitForURL(new RegExp(`/sessions/${sessionId}$`), { timeout: 30_000 });
    await page.locator('[data-testid="session-status"][data-status="failed"]').waitFor({ timeout: 120_000 });
    expect(await page.getByTestId("failure-reason").textContent()).toMatch(/1,800 rows repeat the time stamp of the row before/);
    const choice = page.getByTestId("keep-first-choice");
    await choice.waitFor({ timeout: 30_000 });
    expect(await choice.textContent()).toMatch(/1,800 rows would be dropped/);
    await shot(page, "repeated-times-refused");
  });

  it("one click imports it keeping the first row of each stamp; the session page says how many were dropped", async () => {
    await page.getByTestId("keep-first-choice").getByRole("button", { name: "Keep the first row of each time stamp" }).click();
    try {
      await page.locator('[data-testid="session-status"][data-status="ready"]').waitFor({ timeout: 60_000 });
    } catch (e) {
      await shot(page, "repeated-times-not-ready");
      console.log("[debug]", (await page.locator("main").textContent())?.slice(0, 1500));
      throw e;
    }
    const notes = page.getByTestId("import-notes");
    await notes.waitFor({ timeout: 30_000 });
    expect(await notes.textContent()).toMatch(/1,800 rows repeating the time stamp of the row before were dropped \(the first row of each time stamp kept\)\./);
    expect(await page.getByTestId("keep-first-choice").count()).toBe(0);
    await shot(page, "repeated-times-imported");
  });
});
