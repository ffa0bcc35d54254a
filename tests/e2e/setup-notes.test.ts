/**
 * Setup sheet and notes on the session page, in headless Chromium against the production build
 * and the demo seed: the engineer records a setup and changes one setting, which becomes version 2
 * with the change marked; the demo rider writes a note on their own session; the viewer reads
 * both and finds nothing to edit.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, shot, appUrl, signIn } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";

let browser: Browser;
let sessionId: string;

const user = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

async function pageAs(role: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await ctx.newPage();
  await signIn(page, user(role).email, DEMO_PASSWORD);
  return page;
}

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("setup sheet and notes", () => {
  it("the engineer saves a setup, changes the fork preload and sees version 2 with the change marked", async () => {
    const page = await pageAs("engineer");
    // The first demo session: the demo rider's Practice 1.
    await page.goto(`${appUrl()}/sessions`);
    const row = page.getByTestId("sessions-table").locator("tbody tr").filter({ hasText: "Practice 1" }).filter({ hasText: user("rider").name }).first();
    const link = row.getByRole("link", { name: "Practice 1" });
    await link.waitFor();
    sessionId = (await link.getAttribute("href"))!.split("/").pop()!;
    expect(sessionId).toMatch(/^\d+$/);
    await page.goto(`${appUrl()}/sessions/${sessionId}`);

    const sheet = page.getByTestId("setup-sheet");
    await sheet.waitFor();
    await expect(sheet.getByTestId("caution").isVisible()).resolves.toBe(true);
    await expect(sheet.getByText("No setup recorded for this session yet.").isVisible()).resolves.toBe(true);
    const form = sheet.getByRole("form", { name: "Setup sheet" });
    const input = (name: string) => form.locator(`[name="${name}"]`);
    // With no version yet, the form is open and starts from the bike's sprockets.
    await expect(input("sprocketRearTeeth").inputValue()).resolves.toMatch(/^\d+$/);
    await input("forkSpringNmm").fill("10");
    await input("forkPreloadMm").fill("5");
    await input("shockSpringNmm").fill("95");
    await input("tyreFrontCompound").fill("Soft slick");
    await input("tyreRearColdBar").fill("1.6");
    await input("tractionControlLevel").fill("4");
    await form.getByRole("button", { name: "Save as version 1" }).click();
    await sheet.getByText(/^Version 1 saved/).waitFor({ timeout: 30_000 });

    await input("forkPreloadMm").fill("6");
    await form.getByRole("button", { name: "Save as version 2" }).click();
    await sheet.getByText("Version 2 saved (1 field changed).").waitFor({ timeout: 30_000 });
    await expect(sheet.getByTestId("setup-latest").textContent()).resolves.toMatch(new RegExp(`Version 2 · ${user("engineer").name}`));
    const preload = sheet.locator('[data-testid="setup-value"][data-field="forkPreloadMm"]');
    await expect(preload.getAttribute("data-changed")).resolves.toBe("true");
    await expect(preload.textContent()).resolves.toMatch(/6 mm.*changed.*was 5 mm/);
    expect(await sheet.locator('[data-testid="setup-value"][data-changed="true"]').count()).toBe(1);
    await expect(sheet.getByTestId("setup-version").count()).resolves.toBe(2);
    await expect(sheet.getByTestId("setup-version").first().textContent()).resolves.toContain("Fork preload: 5 mm → 6 mm");
    await shot(page, "setup-sheet-engineer");
    await page.context().close();
  });

  it("the rider reads the sheet and adds a note about a lap of their own session", async () => {
    const page = await pageAs("rider");
    await page.goto(`${appUrl()}/sessions/${sessionId}`);
    const sheet = page.getByTestId("setup-sheet");
    await sheet.waitFor();
    await expect(sheet.getByText("Read-only: engineers and the team owner edit setup sheets.").isVisible()).resolves.toBe(true);
    expect(await sheet.getByRole("form").count()).toBe(0);

    const notes = page.getByTestId("session-notes");
    await notes.getByLabel("New note").fill("Front pushes wide on the entry to the hairpin once the tyre is hot.");
    await notes.getByLabel("About").selectOption({ label: "Lap 3" });
    await notes.getByRole("button", { name: "Add note" }).click();
    const note = notes.getByTestId("note").filter({ hasText: "Front pushes wide" });
    await note.waitFor({ timeout: 30_000 });
    await expect(note.textContent()).resolves.toMatch(new RegExp(`${user("rider").name} · .* UTC · Lap 3`));
    await expect(note.getByRole("button", { name: /^Delete/ }).isVisible()).resolves.toBe(true);
    await shot(page, "session-notes-rider");
    await page.context().close();
  });

  it("the viewer sees the setup version and the note, read-only", async () => {
    const page = await pageAs("viewer");
    await page.goto(`${appUrl()}/sessions/${sessionId}`);
    const sheet = page.getByTestId("setup-sheet");
    await sheet.waitFor();
    await expect(sheet.getByTestId("setup-latest").textContent()).resolves.toMatch(/Version 2/);
    await expect(sheet.locator('[data-testid="setup-value"][data-field="forkPreloadMm"]').getAttribute("data-changed")).resolves.toBe("true");
    expect(await sheet.getByRole("form").count()).toBe(0);
    expect(await sheet.getByText(/Edit setup/).count()).toBe(0);

    const notes = page.getByTestId("session-notes");
    await expect(notes.getByTestId("note").filter({ hasText: "Front pushes wide" }).isVisible()).resolves.toBe(true);
    await expect(notes.getByText("Viewers read notes; the owner, engineers and the session's rider write them.").isVisible()).resolves.toBe(true);
    expect(await notes.getByRole("form").count()).toBe(0);
    expect(await notes.getByRole("button").count()).toBe(0);
    await shot(page, "setup-notes-viewer");
    await page.context().close();
  });
});
