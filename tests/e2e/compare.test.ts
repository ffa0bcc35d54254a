/**
 * Compare, as a data engineer would use it in Chromium against the production build: open a ready
 * demo session, tick two laps in the lap table, Compare — it opens on the corner view — then the
 * whole lap: the default panes, the gained/lost band under each x axis, the values at the cursor
 * as chips in each caption — checked against the series the API serves — zoom (finer data for the
 * stretch), then open the same link in a new page and find the same laps, panes and zoom.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { decodeSeries } from "../../lib/series/binary";
import type { LapSeriesMeta } from "../../lib/series/lap-series-meta";
import { nearestIndex } from "../../components/compare/series-lookup";
import { at } from "../fixtures/at";

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
let served: { meta: LapSeriesMeta; arrays: ReturnType<typeof decodeSeries>["arrays"] };

async function servedSeries(p: Page) {
  const url = await p.getByTestId("compare").getAttribute("data-series-url");
  const res = await p.request.get(`${appUrl()}${url}`);
  expect(res.status()).toBe(200);
  expect(res.headers()["content-type"]).toBe("application/octet-stream");
  return { url: url!, ...decodeSeries<LapSeriesMeta>(await res.body()) };
}

describe("Compare from the lap table", () => {
  it("ticks two laps and opens on the corner view: one card per corner with the served figures", async () => {
    const { id, laps } = await readyDemoSession();
    const flying = laps.filter((l) => !l.outLap && !l.inLap && !l.pitPass && !l.invalid);
    const [a, b] = [at(flying, 1), at(flying, 2)];
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
    expect(await page.getByTestId("compare").getAttribute("data-mode")).toBe("corners");

    served = await servedSeries(page);
    const { meta } = served;
    expect(meta.laps.map((l) => l.lap)).toEqual([a.number, b.number]);
    // The demo circuit's corners are named on its track: the cards follow them, in lap order.
    expect(meta.cornerSource).toBe("track");
    expect(meta.corners.length).toBeGreaterThanOrEqual(4);
    const cards = page.getByTestId("corner-card");
    await expect(cards.count()).resolves.toBe(meta.corners.length);
    expect(await cards.evaluateAll((els) => els.map((e) => e.getAttribute("data-corner")))).toEqual(meta.corners.map((c) => c.name));
    for (let k = 0; k < meta.corners.length; k++) {
      expect(Number(await page.getByTestId(`corner-gained-${k}-1`).getAttribute("data-si"))).toBe(at(meta.corners, k).laps[1]!.gainedS);
    }
    // Each card has its small speed trace, one line per lap.
    await expect(cards.first().locator("svg path").count()).resolves.toBe(2);
    await shot(page, "compare-02-corners");
  });

  it("Whole lap: our default panes — Inputs, Speed, Chassis, Engine speed with gear — and no gap pane", async () => {
    await page.getByRole("group", { name: "Compare by" }).getByRole("button", { name: "Whole lap" }).click();
    await page.waitForURL(/view=lap/);
    await waitDrawn(page);
    const panes = await page.getByTestId("panes").locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    expect(panes).toEqual(["pane-inputs", "pane-speed", "pane-chassis", "pane-engine"]);
    // Inputs: throttle up, front and rear brake mirrored down on their own (right) axis.
    expect(await page.getByTestId("pane-inputs").getAttribute("data-axes")).toBe("thr:left brk:right:down");
    // Two laps × throttle, front brake, rear brake: the brakes share the mirrored scale.
    expect(await page.getByTestId("pane-inputs").getAttribute("data-series-scales")).toBe("thr thr brk brk brk brk");
    expect(await page.getByTestId("pane-speed").getAttribute("data-series-scales")).toBe("y y y y");
    expect(await page.getByTestId("pane-chassis").getAttribute("data-series-scales")).toBe("y y y y");
    // Engine speed on the left axis, gear steps on a second axis on the right.
    expect(await page.getByTestId("pane-engine").getAttribute("data-axes")).toBe("y:left gear:right");
    expect(await page.getByTestId("pane-engine").getAttribute("data-series-scales")).toBe("y y gear gear");
    await page.getByTestId("pane-gap").waitFor({ state: "detached" });
    // The x axis is labelled by the track's corners, and no two drawn labels overlap (each
    // label's measured extent, in CSS px, ends before the next begins).
    for (const id of panes) {
      const labels = JSON.parse((await page.getByTestId(id!).locator("[data-x-labels]").getAttribute("data-x-labels")) ?? "[]") as { text: string; left: number; right: number }[];
      expect(labels.length).toBeGreaterThanOrEqual(2);
      expect(labels.every((l) => /^(Turn|T)\s?\d+$/.test(l.text))).toBe(true);
      for (let i = 1; i < labels.length; i++) expect(labels[i - 1].right).toBeLessThan(labels[i].left);
    }
  });

  it("values at the cursor are chips in each pane's caption, one per lap and channel, as served", async () => {
    const over = page.getByTestId("pane-speed").locator(".u-over");
    await over.scrollIntoViewIfNeeded();
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
    await page.mouse.move(box.x + box.width * 0.4 + 3, box.y + box.height / 2);
    await page.getByTestId("chip-pane-speed-0").waitFor();
    await shot(page, "compare-03-cursor-chips");
    const { meta, arrays } = await servedSeries(page);
    const x = Number(await page.getByTestId("cursor-x").getAttribute("data-si"));
    expect(x).toBeGreaterThan(0);
    // Speed pane: front for each lap, then rear for each lap.
    const order: [string, number][] = [["speed_front", 0], ["speed_front", 1], ["speed_rear", 0], ["speed_rear", 1]];
    for (const [i, [role, lap]] of order.entries()) {
      const pane = meta.panes.find((p) => p.role === role)!;
      const k = nearestIndex(at(arrays, pane.x), x);
      expect(Number(await page.getByTestId(`chip-pane-speed-${i}`).getAttribute("data-si"))).toBeCloseTo(at(at(arrays, pane.series[lap]!), k), 4);
    }
    // Shown in the display unit: km/h, one decimal (metric default).
    const front = meta.panes.find((p) => p.role === "speed_front")!;
    const v = at(at(arrays, front.series[0]!), nearestIndex(at(arrays, front.x), x));
    await expect(page.getByTestId("chip-pane-speed-0").textContent()).resolves.toContain(`${(v * 3.6).toFixed(1)} km/h`);
    // Inputs: throttle, front brake, rear brake × two laps = six chips.
    await expect(page.getByTestId("pane-inputs").locator('[data-testid^="chip-"]').count()).resolves.toBe(6);
  });

  it("a thin signed band under every x axis shows where the second lap gained and where it lost", async () => {
    const { meta, arrays } = served;
    const gap = at(arrays, meta.gap!.series[1]!);
    // The served gap both rises and falls along the lap, so both signs must be drawn.
    let up = 0, down = 0;
    for (let i = 1; i < gap.length; i++) {
      if (at(gap, i) > at(gap, i - 1)) up++;
      else if (at(gap, i) < at(gap, i - 1)) down++;
    }
    expect(up).toBeGreaterThan(0);
    expect(down).toBeGreaterThan(0);
    for (const pane of ["inputs", "speed", "chassis", "engine"]) {
      const host = page.getByTestId(`pane-${pane}`).locator("[data-gap-gained]");
      const gained = Number(await host.getAttribute("data-gap-gained"));
      const lost = Number(await host.getAttribute("data-gap-lost"));
      expect(gained).toBeGreaterThan(0);
      expect(lost).toBeGreaterThan(0);
    }
    // The band's pixels are drawn: teal above the band's middle line, amber below, under the x axis.
    const colours = await page.getByTestId("pane-speed").locator("canvas").first().evaluate((cv) => {
      const c = (cv as HTMLCanvasElement).getContext("2d")!;
      const h = (cv as HTMLCanvasElement).height, w = (cv as HTMLCanvasElement).width;
      const img = c.getImageData(0, Math.floor(h * 0.75), w, h - Math.floor(h * 0.75)).data;
      let teal = 0, amber = 0;
      for (let i = 0; i < img.length; i += 4) {
        if (img[i] === 0x4f && img[i + 1] === 0xd1 && img[i + 2] === 0xc5) teal++;
        if (img[i] === 0xf5 && img[i + 1] === 0x9e && img[i + 2] === 0x1b) amber++;
      }
      return { teal, amber };
    });
    expect(colours.teal).toBeGreaterThan(0);
    expect(colours.amber).toBeGreaterThan(0);
  });

  it("the Running gap pane is an option, and its chips are the served gap", async () => {
    // The box follows the URL, so click and wait for the pane rather than for the box.
    await page.getByLabel("Running gap pane").click();
    await page.getByTestId("pane-gap").waitFor();
    const panes = await page.getByTestId("panes").locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    expect(panes[0]).toBe("pane-gap");
    const over = page.getByTestId("pane-gap").locator(".u-over");
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height / 2);
    await page.mouse.move(box.x + box.width * 0.6 + 2, box.y + box.height / 2);
    await page.getByTestId("chip-pane-gap-0").waitFor();
    const x = Number(await page.getByTestId("cursor-x").getAttribute("data-si"));
    const { meta, arrays } = await servedSeries(page);
    const gk = nearestIndex(at(arrays, meta.gap!.x), x);
    expect(Number(await page.getByTestId("chip-pane-gap-0").getAttribute("data-si"))).toBeCloseTo(at(at(arrays, meta.gap!.series[1]!), gk), 5);
    await page.getByLabel("Running gap pane").click();
    await page.getByTestId("pane-gap").waitFor({ state: "detached" });
  });

  it("zooms by dragging: the URL keeps the zoom and finer data is fetched for that stretch only", async () => {
    const over = page.getByTestId("pane-inputs").locator(".u-over");
    await over.scrollIntoViewIfNeeded();
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2, { steps: 5 });
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height / 2, { steps: 5 });
    await page.mouse.up();
    await page.waitForURL(/from=\d+(\.\d+)?&to=\d+/);
    await page.locator('[data-testid="compare"][data-series-url*="from="]').waitFor();
    await waitDrawn(page);
    const from = Number(new URL(page.url()).searchParams.get("from"));
    const to = Number(new URL(page.url()).searchParams.get("to"));
    const zoomed = await servedSeries(page);
    expect(zoomed.url).toMatch(/&from=.*&to=/);
    expect(zoomed.meta.window[0]).toBeGreaterThanOrEqual(from - 1);
    expect(zoomed.meta.window[1]).toBeLessThanOrEqual(to + 1);
    // Finer than the whole lap: more points per metre in the stretch.
    const perM = (m: LapSeriesMeta, arr: typeof zoomed.arrays) => at(arr, at(m.panes, 0).x).length / (at(m.window, 1) - at(m.window, 0));
    expect(perM(zoomed.meta, zoomed.arrays)).toBeGreaterThan(perM(served.meta, served.arrays));
    // …and the pane draws them: the points it holds match the window's series, more per metre than the whole lap's.
    const held = Number(await page.getByTestId("pane-inputs").getAttribute("data-points"));
    expect(held).toBe(zoomed.arrays[zoomed.meta.panes.find((p) => p.role === "throttle")!.x].length);
    expect(held / (to - from)).toBeGreaterThan(perM(served.meta, served.arrays));
    // Every pane follows the zoom (synced through the setScale hook).
    const ranges = await page.locator("[data-x-min]").evaluateAll((els) => els.map((e) => [Number((e as HTMLElement).dataset.xMin), Number((e as HTMLElement).dataset.xMax)]));
    expect(ranges.length).toBe(4);
    for (const r of ranges) {
      expect(r[0]).toBeCloseTo(from, 0);
      expect(r[1]).toBeCloseTo(to, 0);
    }
    compareUrl = page.url();
    await shot(page, "compare-04-zoomed");
  });

  it("a teammate opening the link sees the same laps, panes and zoom", async () => {
    const from = Number(new URL(compareUrl).searchParams.get("from"));
    const to = Number(new URL(compareUrl).searchParams.get("to"));
    const other = await ctx.newPage();
    await other.goto(compareUrl);
    await waitDrawn(other);
    expect(await other.getByTestId("lap-keys").textContent()).toBe(await page.getByTestId("lap-keys").textContent());
    const panes = await other.locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    const myPanes = await page.locator('[data-testid^="pane-"]').evaluateAll((els) => els.map((e) => e.getAttribute("data-testid")));
    expect(panes).toEqual(myPanes);
    const r = await other.getByTestId("pane-speed").locator("[data-x-min]").evaluate((e) => [Number((e as HTMLElement).dataset.xMin), Number((e as HTMLElement).dataset.xMax)]);
    // Metric display: the axis is in metres, as stored.
    expect(r[0]).toBeCloseTo(from, 0);
    expect(r[1]).toBeCloseTo(to, 0);
    await other.close();
  });

  it("switches to imperial: speeds in mph, the zoom unchanged in the URL", async () => {
    await page.getByRole("group", { name: "Units" }).getByRole("button", { name: "imperial" }).click();
    await page.getByTestId("pane-speed").getByText("[mph]").first().waitFor();
    expect(page.url()).toBe(compareUrl);
    await page.getByRole("group", { name: "Units" }).getByRole("button", { name: "metric" }).click();
    await page.getByRole("button", { name: "Show the whole lap" }).click();
    await page.waitForURL((u) => !u.searchParams.has("from"));
    await waitDrawn(page);
    await page.mouse.move(0, 0);
    await shot(page, "compare-05-whole-lap");
  });
});
