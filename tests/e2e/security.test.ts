/**
 * The production build's defaults as a stranger meets them: security headers, the app bound to
 * loopback, the captured-mail page, a refused start without a proper session secret, the demo note
 * and a sign-in return path that cannot leave the site.
 */
import { spawn } from "node:child_process";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser } from "playwright-core";
import { launch, shot, appUrl } from "./browser";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { PEER_ADDRESS_PRELOAD } from "../../workers/services/stack";
import { DEV_AUTH_SECRET } from "../../lib/security/auth-secret";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("security headers on the production build", () => {
  it.each(["/sign-in", "/api/team", "/dev/mail"])("%s carries CSP without unsafe-eval, no framing, nosniff and a Referrer-Policy", async (p) => {
    const r = await fetch(`${appUrl()}${p}`, { redirect: "manual" });
    const csp = r.headers.get("content-security-policy") ?? "";
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("default-src 'self'");
    expect(csp).not.toContain("unsafe-eval");
    expect(r.headers.get("x-content-type-options")).toBe("nosniff");
    expect(r.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(r.headers.get("x-frame-options")).toBe("DENY");
    expect(r.headers.get("strict-transport-security")).toBeNull(); // http://localhost: no HSTS
  });

  it("the pages work under that CSP (a signed-in page renders and hydrates)", async () => {
    const page = await browser.newPage();
    const violations: string[] = [];
    page.on("console", (m) => {
      if (/Content Security Policy/i.test(m.text())) violations.push(m.text());
    });
    await page.goto(`${appUrl()}/sign-in`);
    await page.getByLabel("E-mail").fill(DEMO_USERS[1].email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/home$/);
    expect(violations).toEqual([]);
    await page.close();
  });
});

describe("network exposure", () => {
  const port = () => Number(new URL(appUrl()).port);

  it("the app listens on 127.0.0.1 only: another interface of this machine is refused", async () => {
    // IPv4 addresses of the other interfaces (link-local IPv6 would need a scope id to connect to).
    const lan = Object.values(os.networkInterfaces()).flat().filter((i) => i && !i.internal && i.family === "IPv4").map((i) => i!.address);
    expect(lan.length).toBeGreaterThan(0); // the check needs a second interface to mean anything
    for (const addr of lan) {
      const outcome = await new Promise<string>((resolve) => {
        const s = net.connect({ host: addr, port: port() });
        s.once("connect", () => (s.destroy(), resolve("connected")));
        s.once("error", (e: NodeJS.ErrnoException) => resolve(e.code ?? "error"));
      });
      expect([addr, outcome]).toEqual([addr, "ECONNREFUSED"]);
    }
  });

  it("/dev/mail is served to this machine, whatever a client claims in X-Forwarded-For", async () => {
    const r = await fetch(`${appUrl()}/dev/mail`, { headers: { "x-forwarded-for": "203.0.113.5" } });
    expect(r.status).toBe(200);
    expect(await r.text()).toContain("Captured e-mail");
  });

  it("a production server refuses to start without a proper BETTER_AUTH_SECRET", async () => {
    const next = path.resolve(__dirname, "../../node_modules/next/dist/bin/next");
    for (const secret of [undefined, DEV_AUTH_SECRET, "too-short"]) {
      const env = { ...process.env, NODE_ENV: "production" } as NodeJS.ProcessEnv;
      if (secret === undefined) delete env.BETTER_AUTH_SECRET;
      else env.BETTER_AUTH_SECRET = secret;
      const child = spawn(process.execPath, ["--import", PEER_ADDRESS_PRELOAD, next, "start", "-p", "0", "-H", "127.0.0.1"], {
        cwd: path.resolve(__dirname, "../.."),
        env,
        stdio: ["ignore", "pipe", "pipe"],
      });
      let out = "";
      child.stdout.on("data", (c: Buffer) => (out += c));
      child.stderr.on("data", (c: Buffer) => (out += c));
      const code = await new Promise<number | null>((resolve) => {
        const t = setTimeout(() => (child.kill("SIGKILL"), resolve(null)), 60_000);
        child.once("exit", (c) => (clearTimeout(t), resolve(c)));
      });
      expect(code).toBe(1);
      expect(out).toMatch(/refusing to start: BETTER_AUTH_SECRET (is not set|is the development value|is 9 bytes long)/);
    }
  });
});

describe("sign-in page", () => {
  it("says that the demo sign-ins are on", async () => {
    const page = await browser.newPage();
    await page.goto(`${appUrl()}/sign-in`);
    await expect(page.getByTestId("demo-note").textContent()).resolves.toMatch(/npm start -- --demo/);
    await shot(page, "sign-in-demo-note");
    await page.close();
  });

  it("a return path to another site (/\\evil) is replaced by the app's own start page", async () => {
    const page = await browser.newPage();
    await page.goto(`${appUrl()}/sign-in?next=${encodeURIComponent("/\\evil.example/steal")}`);
    await page.getByLabel("E-mail").fill(DEMO_USERS[1].email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/home$/);
    expect(new URL(page.url()).origin).toBe(new URL(appUrl()).origin);
    await page.close();
  });
});
