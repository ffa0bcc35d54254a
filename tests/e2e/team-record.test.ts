/**
 * The team's record in headless Chromium against the production build and the demo seed: the
 * season record for each role (a rider sees only their rows), opening an older setup version and
 * comparing it, the effect view with its caution, the "session ready" mail the seed's imports sent
 * to the demo rider (read from the captured mail, its link followed), a printed setup sheet
 * (print stylesheet in Chromium's print-to-PDF, checked with poppler's pdftotext and pdfinfo) and
 * the owner's export (listed and read with Debian's unzip).
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { inject } from "vitest";
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import Papa from "papaparse";
import { launch, shot, appUrl, signIn, SHOTS } from "./browser";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS } from "../../workers/demo-accounts";
import { findLatestMailTo } from "../../lib/mail/captured-mail";

let browser: Browser;
const user = (role: string) => DEMO_USERS.find((u) => u.role === role)!;
const ids: Record<string, string> = {};
const OUT = path.resolve(__dirname, "../../test-output");

function ensurePoppler(): void {
  try {
    execFileSync("pdftotext", ["-v"], { stdio: "ignore" });
  } catch {
    execFileSync("apt-get", ["install", "-y", "-q", "poppler-utils"], { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
  }
}

async function pageAs(role: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1366, height: 900 }, acceptDownloads: true });
  const page = await ctx.newPage();
  await signIn(page, user(role).email, DEMO_PASSWORD);
  return page;
}

beforeAll(async () => {
  ensurePoppler();
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("season record", () => {
  for (const role of ["owner", "engineer", "viewer", "rider"]) {
    it(`${role}: events in date order with their sessions, sortable and paged, best laps per track, progression chart`, async () => {
      const page = await pageAs(role);
      await page.goto(`${appUrl()}/season`);
      const table = page.getByTestId("season-table");
      await table.waitFor();
      const events = await page.getByTestId("season-event").allTextContents();
      expect(events.some((e) => e.includes("Spring test days"))).toBe(true);
      expect(events.findIndex((e) => e.includes("Spring test days"))).toBeLessThan(events.findIndex((e) => e.includes("Summer round")));
      const rows = table.locator('[data-testid="season-row"]');
      const riderCol = async () => (await rows.evaluateAll((trs) => trs.map((tr) => tr.children[3]?.textContent ?? "")));
      if (role === "rider") {
        expect(new Set(await riderCol())).toEqual(new Set([user("rider").name]));
      } else {
        expect(await rows.count()).toBeGreaterThanOrEqual(5);
        expect(new Set(await riderCol()).size).toBe(2);
      }
      for (const name of ["Summer FP1", "Summer FP2"]) {
        const href = await table.getByRole("link", { name, exact: true }).getAttribute("href");
        ids[name] = href!.split("/").pop()!;
      }
      // Sort by best lap: the table library orders the column ascending on the first click.
      await table.getByRole("button", { name: /Best lap/ }).click();
      await expect(table.locator("th[aria-sort]").first().getAttribute("aria-sort")).resolves.toBe("ascending");
      const times = (await rows.evaluateAll((trs) => trs.map((tr) => tr.children[5]?.textContent ?? ""))).filter((t) => t !== "—");
      expect(times).toEqual([...times].sort());
      await page.getByTestId("progression-chart").locator("canvas").first().waitFor();
      expect(Number(await page.getByTestId("progression-chart").getAttribute("data-points"))).toBe(2);
      expect(await page.getByTestId("track-best").count()).toBeGreaterThanOrEqual(1);
      await shot(page, `season-record-${role}`);
      await page.context().close();
    });
  }

  it("filters by rider through the form", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${appUrl()}/season`);
    await page.getByLabel("Rider").selectOption({ label: "Jory Penhallow" });
    await page.getByRole("button", { name: "Show" }).click();
    await page.waitForURL(/rider=\d+/);
    const riders = await page.getByTestId("season-row").evaluateAll((trs) => trs.map((tr) => tr.children[3]?.textContent));
    expect(riders.length).toBeGreaterThan(0);
    expect(new Set(riders)).toEqual(new Set(["Jory Penhallow"]));
    await page.context().close();
  });
});

describe("setup history and effect", () => {
  it("the engineer saves version 2 of Summer FP1, then opens version 1 in full and compares the two", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${appUrl()}/sessions/${ids["Summer FP1"]}`);
    const sheet = page.getByTestId("setup-sheet");
    await sheet.getByText(/Edit setup \(saves as version 2\)/).click();
    const form = sheet.getByRole("form", { name: "Setup sheet" });
    await form.locator('[name="tractionControlLevel"]').fill("5");
    await form.getByRole("button", { name: "Save as version 2" }).click();
    await sheet.getByText("Version 2 saved (1 field changed).").waitFor({ timeout: 30_000 });

    await sheet.getByRole("link", { name: "Version 1" }).click();
    await page.waitForURL(/\/setup\?v=1$/);
    const open = page.getByTestId("setup-open-version");
    await expect(open.getAttribute("data-version")).resolves.toBe("1");
    await expect(open.textContent()).resolves.toMatch(/an earlier version; latest is 2/);
    await expect(open.locator('[data-field="tractionControlLevel"]').textContent()).resolves.toMatch(/4$/);
    await expect(open.locator('[data-field="shockReboundClicks"]').textContent()).resolves.toMatch(/12 clicks out/);
    await expect(open.locator('[data-field="notes"]').textContent()).resolves.toMatch(/Rear pumps on the exit of Turn 6/);
    await shot(page, "setup-history-version-1");

    await page.getByRole("link", { name: "compare with version 1" }).click();
    const cmp = page.getByTestId("setup-compare");
    await cmp.waitFor();
    const changed = await cmp.locator('[data-changed="true"]').evaluateAll((rs) => rs.map((r) => r.getAttribute("data-field")));
    expect(changed).toEqual(["tractionControlLevel"]);
    await shot(page, "setup-history-compare");
    await page.context().close();
  });

  it("the effect view shows the rebound change between Summer FP1 and FP2 with lap figures, conditions, sectors and the caution", async () => {
    const page = await pageAs("viewer");
    await page.goto(`${appUrl()}/season/setup-effects`);
    await expect(page.getByTestId("effect-caution").textContent()).resolves.toMatch(/One change rarely explains a lap time alone.*track temperature.*tyre.*fuel/);
    const effect = page.locator(`[data-testid="effect"][data-before="${ids["Summer FP1"]}"][data-after="${ids["Summer FP2"]}"]`);
    await effect.waitFor();
    await expect(effect.getByTestId("effect-changes").textContent()).resolves.toMatch(/Shock rebound: 12 clicks out → 10 clicks out/);
    const best = (await effect.getByTestId("effect-best").locator("td").allTextContents()).map((t) => t.trim());
    expect(best[3]).toMatch(/^-\d+\.\d{3} s$/); // quicker after the change in this invented history
    await expect(effect.textContent()).resolves.toMatch(/Dry, track 29 °C.*Dry, track 33 °C/);
    expect(await effect.getByTestId("effect-sector").count()).toBeGreaterThanOrEqual(1);
    await shot(page, "setup-effects-viewer");
    await page.context().close();
  });
});

describe("session ready mail", () => {
  it("reached the demo rider with their summary and a link that opens their brief", async () => {
    const dir = path.join(inject("e2eDataDir"), "mail");
    const mail = await findLatestMailTo(user("rider").email, dir);
    expect(mail, "a session-ready mail to the rider").toBeDefined();
    expect(mail!.subject).toMatch(/is ready: your brief$/);
    expect(mail!.text).toMatch(/Best lap: \d:\d{2}\.\d{3}/);
    expect(mail!.text).toMatch(/Flying laps: \d+/);
    expect(mail!.html).toMatch(/<html/);
    const link = mail!.links.find((l) => /\/sessions\/\d+\/brief$/.test(l))!;
    expect(link.startsWith(appUrl())).toBe(true);
    const page = await pageAs("rider");
    await page.goto(link);
    await page.waitForURL(/\/sessions\/\d+\/brief$/);
    await page.getByRole("heading").first().waitFor();
    await shot(page, "session-ready-link-rider");
    await page.context().close();
  });
});

describe("printed setup sheet", () => {
  it("prints on A4 with the print stylesheet: header with team, bike, rider, date and version; no navigation", async () => {
    const page = await pageAs("engineer");
    await page.goto(`${appUrl()}/print/setup/${ids["Summer FP2"]}`);
    await page.getByTestId("print-header").waitFor();
    await shot(page, "print-setup-screen");
    await page.emulateMedia({ media: "print" });
    expect(await page.getByRole("navigation", { name: "Main" }).count()).toBe(0);
    await expect(page.locator(".print-toolbar").isVisible()).resolves.toBe(false);
    fs.mkdirSync(OUT, { recursive: true });
    const pdf = path.join(OUT, "setup-sheet.pdf");
    await page.pdf({ path: pdf, preferCSSPageSize: true, printBackground: true });
    const info = execFileSync("pdfinfo", [pdf]).toString();
    // ISO 216 A4 = 210 × 297 mm = 595.28 × 841.89 pt; Chromium rounds the page box to its own grid (within 1 pt).
    const [, w, h] = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(info)!;
    expect(Math.abs(Number(w) - 595.28)).toBeLessThan(1);
    expect(Math.abs(Number(h) - 841.89)).toBeLessThan(1);
    const text = execFileSync("pdftotext", ["-layout", pdf, "-"]).toString();
    for (const s of ["TEAM", DEMO_TEAM.name, "Bike 27", user("rider").name, "2031-07-12", "Setup v1", "CAUTION.", "Shock rebound", "10 clicks out"]) expect(text).toContain(s);
    expect(text).not.toContain("Print or save as PDF");
    // Paper, not the app's dark background: the page's corner (inside the margin) renders white.
    const corner = await page.evaluate(() => getComputedStyle(document.documentElement).colorScheme);
    expect(corner).toBe("light");
    execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", pdf, path.join(SHOTS, "print-setup-pdf")]);
    await page.context().close();
  });
});

describe("team export", () => {
  it("the owner downloads a zip with the README, sessions in SI units, setup sheets and the original uploads", async () => {
    const page = await pageAs("owner");
    await page.goto(`${appUrl()}/team`);
    await shot(page, "team-export-owner");
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: /Download the team export/ }).click()]);
    const zip = path.join(OUT, "team-export.zip");
    await download.saveAs(zip);
    execFileSync("unzip", ["-tq", zip]);
    const names = execFileSync("unzip", ["-Z1", zip]).toString().trim().split("\n");
    for (const n of ["README.md", "sessions.csv", "laps.csv", "setup-sheets.json", "notes.json", "findings.json"]) expect(names).toContain(n);
    const uploads = names.filter((n) => n.startsWith("uploads/"));
    expect(uploads.some((n) => n.endsWith("-demo-session-20min.csv"))).toBe(true);
    expect(uploads.some((n) => n.endsWith("-summer-round-fp2.csv"))).toBe(true);
    const original = fs.readFileSync(path.resolve(__dirname, "../../sample-logs/files/demo-session-20min.csv"));
    const exported = execFileSync("unzip", ["-p", zip, uploads.find((n) => n.endsWith("-demo-session-20min.csv"))!], { maxBuffer: 256 << 20 });
    expect(exported.equals(original)).toBe(true);
    const sessions = Papa.parse<Record<string, string>>(execFileSync("unzip", ["-p", zip, "sessions.csv"]).toString(), { header: true, skipEmptyLines: true }).data;
    expect(sessions.length).toBeGreaterThanOrEqual(5);
    const fp2 = sessions.find((s) => s.title === "Summer FP2")!;
    expect(Number(fp2.best_lap_s)).toBeGreaterThan(60);
    expect(Number(fp2.top_speed_m_per_s)).toBeGreaterThan(50); // m/s, not km/h
    const setups = JSON.parse(execFileSync("unzip", ["-p", zip, "setup-sheets.json"]).toString());
    expect(setups.some((s: { fields: { shockReboundClicks?: number } }) => s.fields.shockReboundClicks === 10)).toBe(true);
    // Not for an engineer.
    const eng = await pageAs("engineer");
    expect((await eng.request.get(`${appUrl()}/api/team/export`)).status()).toBe(403);
    await eng.context().close();
    await page.context().close();
  });
});

describe("every new screen for each role", () => {
  for (const role of ["owner", "engineer", "rider", "viewer"]) {
    it(`${role}: engines, event report, activity and the session record`, async () => {
      const page = await pageAs(role);
      await page.goto(`${appUrl()}/engines`);
      await page.getByRole("heading", { name: "Engines across the season" }).waitFor();
      expect(await page.getByTestId("season-engine").count()).toBe(2);
      await expect(page.getByTestId("season-engine").first().textContent()).resolves.toMatch(/Rebuild interval nearing: 8\d %/);
      await shot(page, `engines-${role}`);
      await page.goto(`${appUrl()}/home`);
      const marked = await page.getByTestId("engines-nearing").count();
      expect(marked).toBe(role === "owner" || role === "engineer" ? 1 : 0);
      if (marked) await shot(page, `home-engine-mark-${role}`);
      await page.goto(`${appUrl()}/sessions/${ids["Summer FP1"]}`);
      const record = page.getByTestId("session-record");
      await record.waitFor();
      // The engineer's save of version 2 above is on the session's log.
      await expect(record.getByTestId("activity-entry").first().textContent()).resolves.toMatch(/Saved setup version 2/);
      const act = await page.goto(`${appUrl()}/activity`);
      if (role === "owner" || role === "engineer") {
        expect(act!.status()).toBe(200);
        await page.getByTestId("activity-list").waitFor();
        await shot(page, `activity-${role}`);
      } else {
        await page.waitForURL(/\/forbidden/);
      }
      await page.goto(`${appUrl()}/season`);
      if (role !== "rider") {
        await page.getByRole("link", { name: "report" }).last().click();
        await page.waitForURL(/\/events\/\d+\/report$/);
        await page.getByTestId("event-best-laps").waitFor();
        await shot(page, `event-report-${role}`);
      }
      await page.context().close();
    });
  }
});
