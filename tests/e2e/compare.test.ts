/**
 * Compare, as a data engineer would use it in Chromium against the production build: open a ready
 * demo session, tick two laps in the lap table, Compare, hover a chart and read the legend —
 * checked against the series the API serves — zoom, then open the same link in a new page and
 * find the same laps, channels and zoom.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { decodeSeries } from "../../lib/series/binary";
import type { LapSeriesMeta } from "../../lib/series/lap-series-meta";
import { nearestIndex } from "../../components/compare/series-lookup";

let browser: Browser;
let ctx: BrowserContext;
let page: Page;
beforeAll(async () => {
  browser = await launch();
  ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  page = await ctx.newPage();
  await signIn(page, DEMO_USERS.find((u) => u.role === "engineer")!.email, DEMO_PASSWORD);
});
afterAll(async () => {
  await browser?.close();
});

interface ApiLap { number: number; lapTimeMs: number; outLap: boolean; inLap: boolean; pitPass: boolean; invalid: boolean }

async function readyDemoSession(): Promise<{ id: number; laps: ApiLap[] }> {
  const res = await page.request.get(`${appUrl()}/api/sessions?limit=100`);
  expect(res.status()).toBe(200);
  const sessions = (await res.json()).sessions as { id: number; status: string; title: string }[];
  for (const s of sessions.filter((x) => x.status === "ready")) {
    const laps = (await (await page.request.get(`${appUrl()}/api/sessions/${s.id}/laps`)).json()).laps as ApiLap[];
    if (laps.filter((l) => !l.outLap && !l.inLap).length >= 3) return { id: s.id, laps };
  }
  throw new Error("no ready demo session with three flying laps");
}

async function waitDrawn(p: Page) {
  await p.locator('[data-testid="compare"][data-drawn-for^="/api/series"]').waitFor({ timeout: 60_000 });
}

let compareUrl = "";

describe("Compare from the lap table", () => {
  it("ticks two laps, compares them, and the legend at the cursor matches the served series", async () => {
    const { id, laps } = await readyDemoSession();
    const flying = laps.filter((l) => !l.outLap && !l.inLap && !l.pitPass && !l.invalid);
    const [a, b] = [flying[1], flying[2]];
    await page.goto(`${appUrl()}/sessions/${id}`);
    await page.getByTestId("lap-table").waitFor();
    await page.getByTestId("best-sector-lap").waitFor();
    await shot(page, "compare-01-lap-table");
    for (const box of await page.getByTestId("lap-table").locator('input[type="checkbox"]').all()) await box.uncheck();
    await page.getByLabel(`Select lap ${a.number} for Compare`).check();
    await page.getByLabel(`Select lap ${b.number} for Compare`).check();
    await page.getByRole("button", { name: "Compare selected" }).click();
    await page.waitForURL(new RegExp(`/compare\\?laps=${id}:${a.number},${id}:${b.number}`));
    await waitDrawn(page);

    // From data arrival to every pane drawn, in the app (performance marks).
    const ms = await page.evaluate(() => {
      const arrived = performance.getEntriesByName("lapbench:series-arrived").at(-1)!.startTime;
      const drawn = performance.getEntriesByName("lapbench:charts-drawn").at(-1)!.startTime;
      return drawn - arrived;
    });
    console.log(`[e2e compare] series arrival → all panes drawn: ${ms.toFixed(0)} ms`);

    // Hover the speed pane at 40 % of its width.
    const over = page.getByTestId("pane-speed_front").locator(".u-over");
    await over.scrollIntoViewIfNeeded();
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
    await page.mouse.move(box.x + box.width * 0.4 + 3, box.y + box.height / 2);
    await page.getByTestId("legend-x").waitFor();
    await shot(page, "compare-02-cursor");

    const url = await page.getByTestId("compare").getAttribute("data-series-url");
    const res = await page.request.get(`${appUrl()}${url}`);
    expect(res.headers()["content-type"]).toBe("application/octet-stream");
    const { meta, arrays } = decodeSeries<LapSeriesMeta>(await res.body());
    expect(meta.laps.map((l) => l.lap)).toEqual([a.number, b.number]);
    expect(meta.laps.map((l) => l.lapTimeMs)).toEqual([a.lapTimeMs, b.lapTimeMs]);
    const x = Number(await page.getByTestId("legend-x").getAttribute("data-si"));
    expect(x).toBeGreaterThan(0);
    for (const role of ["speed_front", "throttle", "engine_rpm"]) {
      const pane = meta.panes.find((p) => p.role === role)!;
      const k = nearestIndex(arrays[pane.x], x);
      for (let lap = 0; lap < 2; lap++) {
        const cell = page.getByTestId(`legend-${role}-${lap}`);
        expect(Number(await cell.getAttribute("data-si"))).toBe(arrays[pane.series[lap]!][k]);
      }
    }
    // Shown in the display unit: front wheel speed in km/h, one decimal (metric default).
    const v = arrays[meta.panes.find((p) => p.role === "speed_front")!.series[0]!][nearestIndex(arrays[meta.panes[0].x], x)];
    await expect(page.getByTestId("legend-speed_front-0").textContent()).resolves.toBe((v * 3.6).toFixed(1));
    // The running gap at the cursor: B behind or ahead of A by the served amount.
    const gk = nearestIndex(arrays[meta.gap!.x], x);
    expect(Number(await page.getByTestId("legend-gap-1").getAttribute("data-si"))).toBe(arrays[meta.gap!.series[1]!][gk]);
  });

  it("zooms by dragging; the URL keeps the zoom", async () => {
    const over = page.getByTestId("pane-throttle").locator(".u-over");
    await over.scrollIntoViewIfNeeded();
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height / 2, { steps: 5 });
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height / 2, { steps: 5 });
    await page.mouse.up();
    await page.waitForURL(/from=\d+(\.\d+)?&to=\d+/);
    // Every pane follows the zoom (synced through the setScale hook).
    const ranges = await page.locator("[data-x-min]").evaluateAll((els) => els.map((e) => [Number((e as HTMLElement).dataset.xMin), Number((e as HTMLElement).dataset.xMax)]));
    expect(ranges.length).toBeGreaterThanOrEqual(3);
    for (const r of ranges) {
      expect(r[0]).toBeCloseTo(ranges[0][0], 0);
      expect(r[1]).toBeCloseTo(ranges[0][1], 0);
    }
    compareUrl = page.url();
    await shot(page, "compare-03-zoomed");
  });

  it("a teammate opening the link sees the same laps, channels and zoom", async () => {
    const from = Number(new URL(compareUrl).searchParams.get("from"));
    const to = Number(new URL(compareUrl).searchParams.get("to"));
    const other = await ctx.newPage();
    await other.goto(compareUrl);
    await waitDrawn(other);
    const heads = await other.getByTestId("legend").locator("thead th").allTextContents();
    const mine = await page.getByTestId("legend").locator("thead th").allTextContents();
    expect(heads).toEqual(mine);
    const panes = await other.locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    const myPanes = await page.locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    expect(panes).toEqual(myPanes);
    const r = await other.getByTestId("pane-speed_front").locator("[data-x-min]").evaluate((e) => [Number((e as HTMLElement).dataset.xMin), Number((e as HTMLElement).dataset.xMax)]);
    // Metric display: the axis is in metres, as stored.
    expect(r[0]).toBeCloseTo(from, 0);
    expect(r[1]).toBeCloseTo(to, 0);
    await shot(other, "compare-04-shared-link");
    await other.close();
  });

  it("switches to imperial: speeds in mph, the zoom unchanged in the URL", async () => {
    await page.getByRole("group", { name: "Units" }).getByRole("button", { name: "imperial" }).click();
    await page.getByTestId("legend").getByText("[mph]").first().waitFor();
    expect(page.url()).toBe(compareUrl);
    await shot(page, "compare-05-imperial");
    await page.getByRole("group", { name: "Units" }).getByRole("button", { name: "metric" }).click();
  });
});
