/** Shared helpers for the end-to-end tests: Debian's Chromium through playwright-core. */
import { chromium, type Browser, type Page } from "playwright-core";
import { inject } from "vitest";
import fs from "node:fs";
import path from "node:path";

export const appUrl = () => inject("appUrl");
export const SHOTS = path.resolve(__dirname, "../../test-output/screenshots");

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: inject("chromium"),
    headless: true,
    // Root in CI needs --no-sandbox; the rest keeps Chromium off the (closed) network.
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage"],
  });
}

export async function shot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(SHOTS, { recursive: true });
  const file = path.join(SHOTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${appUrl()}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  // Riders land on their Rider brief, everyone else on the Team home.
  await page.waitForURL(/\/(home|brief)$/, { timeout: 30_000 });
}
