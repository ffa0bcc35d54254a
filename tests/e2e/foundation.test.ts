/**
 * A person's first minutes with Lapbench, in headless Chromium against the production build:
 * each demo role signs in and sees its own navigation; the owner invites a new engineer, who
 * follows the link in the captured e-mail, creates an account, confirms the address from a second
 * captured e-mail and joins the team.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser } from "playwright-core";
import { launch, shot, signIn, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS } from "../../workers/demo-accounts";
import { NAV_ITEMS } from "../../lib/nav";
import { at } from "../fixtures/at";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const ROLE_TEXT: Record<string, RegExp> = { owner: /Owner/, engineer: /Engineer/, rider: /Rider/, viewer: /Viewer/ };

describe("demo sign-ins", () => {
  for (const u of DEMO_USERS) {
    it(`${u.role} signs in and sees the navigation for that role`, async () => {
      const ctx = await browser.newContext({ viewport: { width: 1280, height: 800 } });
      const page = await ctx.newPage();
      await signIn(page, u.email, DEMO_PASSWORD);
      await expect(page.getByTestId("role").textContent()).resolves.toMatch(at(ROLE_TEXT, u.role));
      await expect(page.getByTestId("team-name").textContent()).resolves.toBe(DEMO_TEAM.name);
      const links = await page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();
      const expected = NAV_ITEMS.filter((i) => i.roles.includes(u.role)).map((i) => i.label);
      expect(links).toEqual(expected);
      await page.getByRole("heading", { name: u.role === "rider" ? "Your sessions" : "Recent sessions" }).waitFor();
      await shot(page, `home-${u.role}`);

      await page.getByRole("link", { name: "Team", exact: true }).click();
      await page.waitForURL(/\/team$/);
      await page.getByTestId("members-table").locator("tbody tr").first().waitFor();
      const rows = await page.getByTestId("members-table").locator("tbody tr").count();
      expect(rows).toBeGreaterThanOrEqual(DEMO_USERS.length);
      const inviteVisible = await page.getByRole("button", { name: "Send invitation" }).isVisible();
      expect(inviteVisible).toBe(u.role === "owner");
      await shot(page, `team-${u.role}`);
      await ctx.close();
    });
  }

  it("a wrong password is refused with a clear message", async () => {
    const page = await browser.newPage();
    await page.goto(`${appUrl()}/sign-in`);
    await page.getByLabel("E-mail").fill(DEMO_USERS[0].email);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByTestId("form-error").textContent()).resolves.toMatch(/invalid|password/i);
    expect(page.url()).toMatch(/\/sign-in/);
    await page.close();
  });

  it("a signed-out visitor is sent to sign in", async () => {
    const page = await browser.newPage();
    await page.goto(`${appUrl()}/team`);
    await page.waitForURL(/\/sign-in\?next=%2Fteam/);
    await page.close();
  });
});

describe("invitation by e-mail", () => {
  it("the owner invites an engineer who accepts from the captured e-mail", async () => {
    const newcomer = `newcomer-${Date.now()}@example.com`;
    const owner = await browser.newContext();
    const op = await owner.newPage();
    await signIn(op, DEMO_USERS[0].email, DEMO_PASSWORD);
    await op.goto(`${appUrl()}/team`);
    await op.getByLabel("E-mail").fill(newcomer);
    await op.getByLabel("Role", { exact: true }).selectOption("engineer");
    await op.getByRole("button", { name: "Send invitation" }).click();
    await op.getByText(`Invitation sent to ${newcomer}.`).waitFor();
    await op.getByTestId("invitations-table").getByText(newcomer).waitFor();
    await shot(op, "team-invitation-sent");
    await owner.close();

    // The newcomer opens the mail page, follows the link, signs up and accepts.
    const guest = await browser.newContext();
    const gp = await guest.newPage();
    await gp.goto(`${appUrl()}/dev/mail`);
    const mail = gp.getByTestId("mail").filter({ hasText: newcomer }).first();
    await mail.waitFor();
    await shot(gp, "dev-mail");
    const link = await mail.getByTestId("mail-link").first().getAttribute("href");
    expect(link).toMatch(/\/accept-invitation\//);
    await gp.goto(link!.replace(/^https?:\/\/[^/]+/, appUrl()));
    await gp.getByRole("heading", { name: `Join ${DEMO_TEAM.name}` }).waitFor();
    await gp.getByRole("link", { name: "Create account" }).click();
    await gp.getByLabel("Name").fill("Sofie Kettering");
    await expect(gp.getByLabel("E-mail").inputValue()).resolves.toBe(newcomer);
    await gp.getByLabel("Password", { exact: true }).fill("a-long-enough-password");
    await gp.getByLabel("Password again").fill("a-long-enough-password");
    await gp.getByRole("button", { name: "Create account" }).click();
    await gp.waitForURL(/\/accept-invitation\//);
    // Only a confirmed address may take the role: the page asks for the mailed confirmation first.
    await gp.getByTestId("verify-first").waitFor();
    await shot(gp, "accept-invitation-confirm-first");
    await gp.goto(`${appUrl()}/dev/mail`);
    const confirm = gp.getByTestId("mail").filter({ hasText: newcomer }).filter({ hasText: "Confirm your Lapbench e-mail address" }).first();
    await confirm.waitFor();
    const confirmLink = await confirm.getByTestId("mail-link").first().getAttribute("href");
    expect(confirmLink).toMatch(/\/api\/auth\/verify-email\?token=/);
    await gp.goto(confirmLink!.replace(/^https?:\/\/[^/]+/, appUrl()));
    await gp.waitForURL(/\/accept-invitation\//);
    await gp.getByRole("button", { name: "Accept and join the team" }).click();
    await gp.waitForURL(/\/home$/);
    await expect(gp.getByTestId("role").textContent()).resolves.toMatch(/Engineer/);
    await expect(gp.getByTestId("team-name").textContent()).resolves.toBe(DEMO_TEAM.name);
    await shot(gp, "home-after-accepting");
    await guest.close();
  });
});
