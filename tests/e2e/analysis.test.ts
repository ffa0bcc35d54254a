/**
 * The analysis screens as the team uses them after an outing, in headless Chromium against the
 * production build and the demo seed: the rider lands on the Rider brief and reads where their
 * braking differed; the engineer (who also tunes suspension and electronics) opens Drive slip,
 * Suspension use and Gears of a demo session and acknowledges a finding with a note.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, shot, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const user = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

async function signInAs(page: Page, role: string, landing: RegExp) {
  await page.goto(`${appUrl()}/sign-in`);
  await page.getByLabel("E-mail").fill(user(role).email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(landing, { timeout: 30_000 });
}

describe("Rider brief", () => {
  it("the demo rider signs in, lands on the brief and reads braking differences corner by corner", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    await signInAs(page, "rider", /\/brief$/);
    await page.getByRole("heading", { name: "Rider brief" }).waitFor();
    const corners = page.getByTestId("brief-corner");
    await corners.first().waitFor();
    expect(await corners.count()).toBeGreaterThanOrEqual(4);
    const texts = await corners.allTextContents();
    const differing = texts.find((t) => /You braked \d+ m (earlier|later) than on your best lap/.test(t));
    expect(differing, texts.join("\n")).toBeDefined();
    // The corner is named beside the sentence.
    const first = corners.filter({ hasText: /You braked \d+ m (earlier|later)/ }).first();
    const name = (await first.getByRole("heading").textContent())!.trim();
    expect(name).toMatch(/\S/);
    expect(await first.textContent()).toContain(name);
    await expect(first.getByText("How hard you braked").isVisible()).resolves.toBe(true);
    await expect(page.getByRole("img", { name: "Track outline with the corners numbered" }).isVisible()).resolves.toBe(true);
    // No channel names in the rider's words.
    expect(texts.join(" ")).not.toMatch(/brake_front|speed_front|Pa\b/);
    await shot(page, "brief-rider");
    // The Team home stays reachable.
    await page.getByRole("main").getByRole("link", { name: "Team home" }).click();
    await page.waitForURL(/\/home$/);
    await page.getByRole("heading", { name: "Team home" }).waitFor();
    await ctx.close();
  });
});

describe("engineer analysis", () => {
  let page: Page;
  let sessionId: string;
  beforeAll(async () => {
    const ctx = await browser.newContext({ viewport: { width: 1366, height: 900 } });
    page = await ctx.newPage();
    await signInAs(page, "engineer", /\/home$/);
    // The demo sessions listed on the brief (the 20-minute practice of the demo rider among them).
    await page.goto(`${appUrl()}/brief`);
    const link = page.getByRole("link", { name: /Practice 1/ }).first();
    await link.waitFor();
    sessionId = new URL((await link.getAttribute("href"))!, appUrl()).searchParams.get("session")!;
    expect(sessionId).toMatch(/^\d+$/);
  });
  afterAll(async () => {
    await page?.context().close();
  });

  it("opens Drive slip: the convention, the target, the chart, spin events and corner exits", async () => {
    await page.goto(`${appUrl()}/sessions/${sessionId}/slip`);
    await page.getByRole("heading", { name: "Drive slip", level: 1 }).waitFor();
    await expect(page.getByText("with the front wheel as the ground reference").isVisible()).resolves.toBe(true);
    await expect(page.getByTestId("slip-target").textContent()).resolves.toMatch(/8\.0 %/);
    await page.getByTestId("slip-chart").locator("canvas").waitFor();
    await page.getByTestId("exit-table").waitFor();
    expect(await page.getByTestId("exit-table").locator("tbody tr").count()).toBeGreaterThanOrEqual(4);
    await expect(page.getByTestId("caution").isVisible()).resolves.toBe(true);
    await shot(page, "drive-slip-engineer");
    await page.getByRole("switch").click();
    await page.waitForURL(/lean=1/);
    await expect(page.getByRole("switch").textContent()).resolves.toMatch(/on/);
  });

  it("opens Suspension use: fork and shock histograms, sag, bottoming; a second lap side by side", async () => {
    await page.goto(`${appUrl()}/sessions/${sessionId}/suspension`);
    await page.getByRole("heading", { name: "Suspension use", level: 1 }).waitFor();
    await page.getByTestId("suspension-fork").waitFor();
    await expect(page.getByText("is our default, not a published figure").isVisible()).resolves.toBe(true);
    await expect(page.getByRole("img", { name: "Fork position histogram" }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole("img", { name: "Shock velocity histogram" }).isVisible()).resolves.toBe(true);
    await expect(page.getByTestId("caution").isVisible()).resolves.toBe(true);
    await shot(page, "suspension-engineer");
    await page.goto(`${appUrl()}/sessions/${sessionId}/suspension?lap=3&cmpLap=4`);
    await page.getByRole("heading", { name: /Lap 4$/ }).waitFor();
    expect(await page.getByTestId("suspension-fork").count()).toBe(2);
    await shot(page, "suspension-side-by-side");
  });

  it("opens Gears: time in each gear and shifts with clutchless upshifts marked", async () => {
    await page.goto(`${appUrl()}/sessions/${sessionId}/gears`);
    await page.getByTestId("gear-table").waitFor();
    expect(await page.getByTestId("gear-table").locator("tbody tr").count()).toBeGreaterThanOrEqual(6);
    await expect(page.getByText(/upshifts, \d+ of them clutchless/).isVisible()).resolves.toBe(true);
    await shot(page, "gears-engineer");
  });

  it("acknowledges a finding with a note on the session page", async () => {
    await page.goto(`${appUrl()}/sessions/${sessionId}`);
    const panel = page.getByTestId("session-findings");
    await panel.waitFor();
    const findings = panel.getByTestId("finding");
    await findings.first().waitFor();
    const before = await findings.count();
    const target = findings.filter({ hasText: "Brake pressure on a straight" }).first();
    await expect(target.getByRole("note").textContent()).resolves.toMatch(/symptom, not a diagnosis/);
    await target.getByRole("button", { name: "Acknowledge with a note…" }).click();
    await target.getByLabel("Note").fill("Lever guard checked in the box: bent by a kerb strike, replaced.");
    await shot(page, "finding-acknowledge-form");
    await target.getByRole("button", { name: "Acknowledge", exact: true }).click();
    // Acknowledged findings leave the "To review" filter.
    await page.waitForFunction((n) => document.querySelectorAll('[data-testid="finding"]').length === n - 1, before, { timeout: 30_000 });
    await panel.getByLabel("Status").selectOption("done");
    const done = panel.getByTestId("finding").filter({ hasText: "Lever guard checked in the box" });
    await done.waitFor();
    await expect(done.getByTestId("acknowledged").textContent()).resolves.toMatch(new RegExp(`Acknowledged by ${user("engineer").name}`));
    await shot(page, "finding-acknowledged");
  });
});
