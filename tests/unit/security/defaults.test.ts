/**
 * The security defaults that need no server: the session-secret rules and its stored per-install
 * value, the security headers, the same-site return path, Secure cookies by the public URL, and
 * who may read the captured-mail page.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { authSecretProblem, assertProductionAuthSecret, DEV_AUTH_SECRET, resolveAuthSecret } from "@/lib/security/auth-secret";
import { contentSecurityPolicy, securityHeaders } from "@/lib/security/headers";
import { safeReturnPath } from "@/lib/http/safe-return-path";
import { secureCookiesFor, authOptions, SESSION_EXPIRES_S } from "@/lib/auth/options";
import { isLocalMailService, mayReadCapturedMail } from "@/lib/mail/mail-page-access";
import { isLoopbackAddress } from "@/lib/security/client-address";
import { uploadToken } from "../../../workers/services/stack";

const env = (e: Record<string, string>) => e as NodeJS.ProcessEnv;

describe("session secret", () => {
  it.each([
    [undefined, /not set/],
    ["", /not set/],
    [DEV_AUTH_SECRET, /development value/],
    ["x".repeat(31), /31 bytes long; it needs at least 32/],
  ])("refuses %j for production", (secret, why) => {
    expect(authSecretProblem(secret)).toMatch(why);
    expect(() => assertProductionAuthSecret(secret)).toThrow(/will not serve a production build/);
  });

  it("accepts a random secret of 32 bytes or more (multi-byte characters count as bytes)", () => {
    expect(authSecretProblem("k".repeat(32))).toBeNull();
    expect(authSecretProblem("é".repeat(16))).toBeNull(); // 2 bytes each in UTF-8
  });

  it("npm start generates a secret once, keeps it private in the data folder and reuses it; the environment wins", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-secret-"));
    try {
      const first = resolveAuthSecret(env({}), dir);
      expect(authSecretProblem(first)).toBeNull();
      expect(resolveAuthSecret(env({}), dir)).toBe(first);
      expect(fs.statSync(path.join(dir, "auth-secret")).mode & 0o777).toBe(0o600);
      expect(resolveAuthSecret(env({ BETTER_AUTH_SECRET: "from-the-environment-".repeat(2) }), dir)).toBe("from-the-environment-".repeat(2));
      // A second install gets another secret.
      const other = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-secret-"));
      expect(resolveAuthSecret(env({}), other)).not.toBe(first);
      fs.rmSync(other, { recursive: true, force: true });
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });

  it("the upload API key is generated per install, and UPLOADTHING_TOKEN from the environment is respected", () => {
    const a = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-upl-"));
    const b = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-upl-"));
    try {
      const key = (t: string) => (JSON.parse(Buffer.from(t, "base64").toString()) as { apiKey: string }).apiKey;
      const ta = uploadToken(a, env({}));
      expect(key(ta)).toMatch(/^sk_[0-9a-f]{64}$/);
      expect(uploadToken(a, env({}))).toBe(ta);
      expect(key(uploadToken(b, env({})))).not.toBe(key(ta));
      expect(uploadToken(a, env({ UPLOADTHING_TOKEN: "ZnJvbS1lbnY=" }))).toBe("ZnJvbS1lbnY=");
    } finally {
      fs.rmSync(a, { recursive: true, force: true });
      fs.rmSync(b, { recursive: true, force: true });
    }
  });
});

describe("security headers", () => {
  const base = { appUrl: "http://localhost:3000", uploadOrigins: ["http://127.0.0.1:4100"] };
  const get = (h: { key: string; value: string }[], k: string) => h.find((x) => x.key === k)?.value;

  it("production CSP has no unsafe-eval, forbids framing and lets the browser reach the upload service", () => {
    const csp = contentSecurityPolicy({ ...base, dev: false });
    expect(csp).not.toContain("unsafe-eval");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("connect-src 'self' http://127.0.0.1:4100");
    expect(contentSecurityPolicy({ ...base, dev: true })).toContain("'unsafe-eval'"); // next dev only
  });

  it("nosniff, Referrer-Policy and no framing always; HSTS only under https", () => {
    const http = securityHeaders({ ...base, dev: false });
    expect(get(http, "X-Content-Type-Options")).toBe("nosniff");
    expect(get(http, "Referrer-Policy")).toBe("strict-origin-when-cross-origin");
    expect(get(http, "X-Frame-Options")).toBe("DENY");
    expect(get(http, "Strict-Transport-Security")).toBeUndefined();
    const https = securityHeaders({ ...base, appUrl: "https://lapbench.example", dev: false });
    expect(get(https, "Strict-Transport-Security")).toMatch(/^max-age=\d{8}/);
  });
});

describe("sign-in return path", () => {
  it.each([
    ["/sessions/12?lap=3#x", "/sessions/12?lap=3#x"],
    ["/accept-invitation/abc", "/accept-invitation/abc"],
    ["/\\evil.example", "/"],
    ["/\\/evil.example", "/"],
    ["//evil.example", "/"],
    ["/\t/evil.example", "/"],
    ["https://evil.example/", "/"],
    ["javascript:alert(1)", "/"],
    ["", "/"],
    [undefined, "/"],
  ])("%j → %j", (next, want) => {
    expect(safeReturnPath(next)).toBe(want);
  });
});

describe("cookies and sessions", () => {
  it("Secure cookies exactly when BETTER_AUTH_URL is https", () => {
    expect(secureCookiesFor("https://lapbench.example")).toBe(true);
    expect(secureCookiesFor("http://localhost:3000")).toBe(false);
  });
  it("sessions expire after 7 days; a password reset revokes them; invitations need a confirmed address", () => {
    expect(SESSION_EXPIRES_S).toBe(7 * 24 * 3600);
    expect(authOptions.session.expiresIn).toBe(SESSION_EXPIRES_S);
    expect(authOptions.emailAndPassword.revokeSessionsOnPasswordReset).toBe(true);
    expect(authOptions.emailVerification.sendOnSignUp).toBe(true);
  });
});

describe("captured-mail page", () => {
  const withClient = (addr: string | null) => new Headers(addr ? { "x-lapbench-client": addr } : {});
  const on = env({ LAPBENCH_MAIL_PAGE: "1" });

  it("only while the local mail service is in use, never with a real SMTP host", () => {
    expect(isLocalMailService("127.0.0.1", on)).toBe(true);
    expect(isLocalMailService("smtp.example.net", on)).toBe(false);
    expect(isLocalMailService("127.0.0.1", env({}))).toBe(false);
  });

  it("only to loopback clients, and only when the web server rewrote the client address", () => {
    globalThis.__lapbenchClientAddress = true;
    try {
      expect(mayReadCapturedMail(withClient("127.0.0.1"), "127.0.0.1", on)).toBe(true);
      expect(mayReadCapturedMail(withClient("::1"), "127.0.0.1", on)).toBe(true);
      expect(mayReadCapturedMail(withClient("192.0.2.7"), "127.0.0.1", on)).toBe(false);
      expect(mayReadCapturedMail(withClient(null), "127.0.0.1", on)).toBe(false);
      expect(mayReadCapturedMail(withClient("127.0.0.1"), "smtp.example.net", on)).toBe(false);
    } finally {
      globalThis.__lapbenchClientAddress = undefined;
    }
    // Without the rewrite a client could send the header itself.
    expect(mayReadCapturedMail(withClient("127.0.0.1"), "127.0.0.1", on)).toBe(false);
    expect(isLoopbackAddress("::ffff:127.0.0.1")).toBe(true);
    expect(isLoopbackAddress("128.0.0.1")).toBe(false);
  });
});
