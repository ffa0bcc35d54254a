/**
 * Tracks, bikes and events in Chromium against the production build and the demo seed:
 * the engineer moves a sector gate of the demo track by clicking its outline and saves (the
 * track's sessions are analysed again); opens a bike and reads the Engine ledger under the
 * caution; a bad rolling circumference is refused at its field. The viewer sees the same pages
 * with nothing to save.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { CIRCUIT } from "../../sample-logs/circuit";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const user = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

async function page(role: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const p = await ctx.newPage();
  await signIn(p, user(role).email, DEMO_PASSWORD);
  return p;
}

const metres = async (p: Page, label: string) => Number((await p.getByTestId(`distance-${label}`).textContent())!.replace(/[^\d.]/g, ""));

/** Screen position of the point a fraction of the way along the drawn outline. */
async function outlinePoint(p: Page, fraction: number): Promise<{ x: number; y: number }> {
  return p.getByTestId("outline-path").evaluate((el, f) => {
    const path = el as SVGPathElement;
    const pt = path.getPointAtLength(path.getTotalLength() * f);
    const s = pt.matrixTransform(path.getScreenCTM()!);
    return { x: s.x, y: s.y };
  }, fraction);
}

let trackUrl = "";
let bikeUrl = "";

describe("engineer", () => {
  it("opens the demo track, moves sector gate 2 by clicking the outline, and saves", async () => {
    const p = await page("engineer");
    await p.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Tracks" }).click();
    await p.waitForURL(/\/tracks$/);
    await p.getByTestId("tracks-table").waitFor();
    await shot(p, "tracks-list-engineer");
    await p.getByRole("link", { name: CIRCUIT.name }).click();
    await p.waitForURL(/\/tracks\/\d+$/);
    trackUrl = p.url();
    await p.getByTestId("outline-path").waitFor();
    await shot(p, "track-editor-engineer");

    const before = await metres(p, "Sector gate 2");
    const lapM = CIRCUIT.lengthM;
    // Halfway between sector 2 and the line: still after sector 1, so it stays "Sector gate 2".
    const targetM = (before + lapM) / 2;
    expect(lapM - before).toBeGreaterThan(200);
    await p.getByRole("button", { name: "Sector gate 2", exact: true }).click();
    const at = await outlinePoint(p, targetM / lapM);
    await p.mouse.click(at.x, at.y);
    const moved = await metres(p, "Sector gate 2");
    expect(Math.abs(moved - targetM)).toBeLessThan(25);
    await p.getByText("Unsaved changes").waitFor();
    await shot(p, "track-editor-gate-moved");

    await p.getByRole("button", { name: "Save track" }).click();
    await p.getByRole("status").filter({ hasText: /Track saved\. \d+ sessions? analysed again\.|Track saved\. No analysed/ }).waitFor({ timeout: 110_000 });
    await shot(p, "track-editor-saved");

    await p.reload();
    await p.getByTestId("outline-path").waitFor();
    expect(Math.abs((await metres(p, "Sector gate 2")) - moved)).toBeLessThan(2);
    expect(Math.abs((await metres(p, "Sector gate 1")) - CIRCUIT.sectorGateDistancesM[0])).toBeLessThan(5);
    await p.context().close();
  });

  it("opens a bike and sees the engine ledger with the caution; a wrong circumference is refused at its field", async () => {
    const p = await page("engineer");
    await p.goto(`${appUrl()}/bikes`);
    await p.getByTestId("bikes-table").waitFor();
    await shot(p, "bikes-list-engineer");
    await p.getByTestId("bikes-table").getByRole("link", { name: "Bike 27" }).click();
    await p.waitForURL(/\/bikes\/\d+$/);
    bikeUrl = p.url();
    await p.getByRole("heading", { name: "Engine ledger" }).waitFor();
    const ledger = p.getByTestId("engine-ledger").first();
    await expect(ledger.getByText("Running hours").isVisible()).resolves.toBe(true);
    await expect(ledger.getByText("Rev-ceiling exceedances").isVisible()).resolves.toBe(true);
    await expect(ledger.textContent()).resolves.toMatch(/Engine LV-E101/);
    await expect(p.getByTestId("caution").textContent()).resolves.toMatch(/symptom, not a diagnosis.*manufacturer's service data.*technical rules.*qualified mechanics/);
    // The tyre hint: 120/70 ZR17 → π·D = 1884 mm (ISO 5751 / ETRTO practice, from memory).
    await expect(p.getByTestId("tyre-calculator").textContent()).resolves.toMatch(/120\/70 ZR17 → nominal 1884 mm/);
    await shot(p, "bike-engine-ledger-engineer");

    await p.getByLabel("Rear rolling circumference").fill("196");
    await p.getByRole("button", { name: "Save bike" }).click();
    await p.getByText("Rear rolling circumference must be between 1000 mm and 2600 mm").waitFor();
    await expect(p.getByLabel("Rear rolling circumference").inputValue()).resolves.toBe("196");
    await p.evaluate(() => window.scrollTo(0, 0));
    await shot(p, "bike-settings-refused");
    await p.context().close();
  });

  it("sees the demo event with its sessions", async () => {
    const p = await page("engineer");
    await p.goto(`${appUrl()}/events`);
    const ev = p.getByTestId("event").filter({ hasText: "Spring test days" });
    await ev.waitFor();
    await expect(ev.getByRole("link", { name: CIRCUIT.name }).isVisible()).resolves.toBe(true);
    await shot(p, "events-engineer");
    await p.context().close();
  });
});

describe("viewer", () => {
  it("sees tracks, bikes and events read-only, with no save buttons", async () => {
    const p = await page("viewer");
    await p.goto(trackUrl || `${appUrl()}/tracks`);
    if (!trackUrl) await p.getByRole("link", { name: CIRCUIT.name }).click();
    await p.getByTestId("outline-path").waitFor();
    expect(await p.getByRole("button", { name: "Save track" }).count()).toBe(0);
    expect(await p.getByRole("toolbar", { name: "Place on the outline" }).count()).toBe(0);
    expect(await p.getByRole("button", { name: /^Delete/ }).count()).toBe(0);
    await expect(p.getByLabel("Pit-lane limit").isDisabled()).resolves.toBe(true);
    await shot(p, "track-viewer");

    await p.goto(`${appUrl()}/tracks`);
    expect(await p.getByRole("button", { name: "Create track" }).count()).toBe(0);

    await p.goto(bikeUrl || `${appUrl()}/bikes`);
    if (!bikeUrl) await p.getByRole("link", { name: "Bike 27" }).click();
    await p.getByTestId("engine-ledger").first().waitFor();
    expect(await p.getByRole("button", { name: /Save|Add engine/ }).count()).toBe(0);
    await expect(p.getByTestId("caution").isVisible()).resolves.toBe(true);
    await shot(p, "bike-viewer");

    await p.goto(`${appUrl()}/events`);
    await p.getByTestId("event").first().waitFor();
    expect(await p.getByRole("button", { name: /Add event|Save event/ }).count()).toBe(0);
    await p.context().close();
  });
});
