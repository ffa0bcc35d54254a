/**
 * Account-takeover defaults against the real MariaDB and a real SMTP exchange: the client address
 * the web server hands to the app (spoofed X-Forwarded-For ignored unless TRUSTED_PROXY), the
 * sign-in and password-reset limits keyed on it, e-mail confirmation before an invitation can be
 * accepted, sessions revoked by a password reset, the explicit session expiry, and upload grants.
 */
import http from "node:http";
import os from "node:os";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import { SMTPServer } from "smtp-server";
import { simpleParser, type ParsedMail } from "mailparser";
import { createSequelize } from "@/models/db";
import { config } from "@/lib/config";
import { createAuth, type LapbenchAuth } from "@/lib/auth/create-auth";
import { RESET_MAILS_PER_ACCOUNT, RESET_REQUEST_RATE_LIMIT, SESSION_EXPIRES_S, SIGN_IN_RATE_LIMIT } from "@/lib/auth/options";
import { dbUploadGrants } from "@/lib/data/upload-grants";
// @ts-expect-error -- plain JavaScript module loaded into the web server process
import { clientAddress, parseTrustedProxies, rewriteRequest } from "../../workers/services/peer-address.mjs";
import { at } from "../fixtures/at";

type Trusted = { count: number; has(a: string): boolean };
const run = `${process.pid}-${Date.now().toString(36)}`;
const email = (who: string) => `${who}-${run}@lapbench.invalid`;
const PASSWORD = "camber-angle-2409";

let db: Sequelize;
let auth: LapbenchAuth;
let smtp: SMTPServer;
const inbox: ParsedMail[] = [];

async function waitForMail(to: string, subject: RegExp, timeoutMs = 5000): Promise<ParsedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = inbox.find((m) => m.to && !Array.isArray(m.to) && m.to.value.some((a) => a.address === to) && subject.test(m.subject ?? ""));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail "${subject}" to ${to} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

function cookieHeaders(res: Headers): Headers {
  return new Headers({ cookie: res.getSetCookie().map((c) => c.split(";")[0]).join("; ") });
}

async function signUpAndIn(who: string): Promise<{ userId: string; headers: Headers }> {
  const up = await auth.api.signUpEmail({ body: { email: email(who), password: PASSWORD, name: `Test ${who}` } });
  const { headers } = await auth.api.signInEmail({ body: { email: email(who), password: PASSWORD }, returnHeaders: true });
  return { userId: up.user.id, headers: cookieHeaders(headers) };
}

/**
 * The auth handler behind a real HTTP server whose requests go through the same rewrite as the
 * web server process (workers/services/peer-address.mjs).
 */
async function serveAuth(trusted: Trusted): Promise<{ url: string; close(): Promise<void> }> {
  const server = http.createServer(async (req, res) => {
    rewriteRequest(req, trusted);
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const headers = new Headers();
    for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
    const r = await auth.handler(
      new Request(`${config.appUrl}${req.url}`, { method: req.method, headers, body: chunks.length ? Buffer.concat(chunks) : undefined }),
    );
    res.writeHead(r.status, { "content-type": r.headers.get("content-type") ?? "text/plain" }).end(Buffer.from(await r.arrayBuffer()));
  });
  await new Promise<void>((ok) => server.listen(0, "127.0.0.1", ok));
  return { url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, close: () => new Promise((ok) => server.close(() => ok())) };
}

beforeAll(async () => {
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    onData(stream, _s, done) {
      simpleParser(stream).then((m) => (inbox.push(m), done()), done);
    },
  });
  await new Promise<void>((resolve) => smtp.listen(0, "127.0.0.1", resolve));
  config.smtp.port = (smtp.server.address() as AddressInfo).port;
  db = createSequelize(process.env.LAPBENCH_DB_NAME!, { pool: 5 });
  auth = createAuth(db, { sendVerificationOnSignUp: true });
});

afterAll(async () => {
  await db?.close();
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
});

describe("client address seen by the app", () => {
  const none: Trusted = parseTrustedProxies("");

  it("is the TCP peer: a client-supplied X-Forwarded-For is replaced, over a real socket", async () => {
    const server = http.createServer((req, res) => {
      rewriteRequest(req, none);
      res.end(JSON.stringify({ xff: req.headers["x-forwarded-for"], client: req.headers["x-lapbench-client"] }));
    });
    await new Promise<void>((ok) => server.listen(0, "0.0.0.0", ok));
    const port = (server.address() as AddressInfo).port;
    try {
      const seen = async (host: string) => (await fetch(`http://${host}:${port}/`, { headers: { "x-forwarded-for": "203.0.113.9", "x-lapbench-client": "127.0.0.1" } })).json();
      expect(await seen("127.0.0.1")).toEqual({ xff: "127.0.0.1", client: "127.0.0.1" });
      // Another interface of this machine: the peer is that address, not loopback.
      const lan = Object.values(os.networkInterfaces()).flat().find((i) => i && i.family === "IPv4" && !i.internal)?.address;
      if (lan) expect(await seen(lan)).toEqual({ xff: lan, client: lan });
    } finally {
      await new Promise<void>((ok) => server.close(() => ok()));
    }
  });

  it("behind TRUSTED_PROXY is the nearest address in the chain that is not a trusted proxy", () => {
    const trusted: Trusted = parseTrustedProxies("127.0.0.1, 10.0.0.0/8");
    expect(clientAddress("127.0.0.1", "203.0.113.9", trusted)).toBe("203.0.113.9");
    expect(clientAddress("::ffff:127.0.0.1", "198.51.100.1, 203.0.113.9, 10.1.2.3", trusted)).toBe("203.0.113.9");
    // A request straight from an untrusted peer keeps the peer, whatever it claims.
    expect(clientAddress("192.0.2.50", "203.0.113.9", trusted)).toBe("192.0.2.50");
    expect(clientAddress("127.0.0.1", "not-an-ip", trusted)).toBe("127.0.0.1");
    expect(() => parseTrustedProxies("proxy.example")).toThrow(/not an IP address or CIDR range/);
  });
});

describe("limits keyed on the client address", () => {
  it(`sign-in: a rotating X-Forwarded-For does not get past ${SIGN_IN_RATE_LIMIT.max} attempts a minute`, async () => {
    const app = await serveAuth(parseTrustedProxies(""));
    try {
      const statuses: number[] = [];
      for (let i = 0; i < SIGN_IN_RATE_LIMIT.max + 2; i++) {
        const r = await fetch(`${app.url}/api/auth/sign-in/email`, {
          method: "POST",
          headers: { "content-type": "application/json", origin: config.appUrl, "x-forwarded-for": `203.0.113.${i + 1}` },
          body: JSON.stringify({ email: email("nobody"), password: "not-the-password-1" }),
        });
        statuses.push(r.status);
      }
      expect(statuses.slice(-2)).toEqual([429, 429]);
    } finally {
      await app.close();
    }
  });

  it(`password reset: at most ${RESET_REQUEST_RATE_LIMIT.max} requests per ${RESET_REQUEST_RATE_LIMIT.window / 60} minutes from one address`, async () => {
    // Behind a trusted proxy on loopback: each test run's own client address, so reruns of other tests do not count.
    const app = await serveAuth(parseTrustedProxies("127.0.0.1"));
    const client = `198.51.100.${(process.pid % 200) + 1}`;
    try {
      const statuses: number[] = [];
      for (let i = 0; i < RESET_REQUEST_RATE_LIMIT.max + 1; i++) {
        const r = await fetch(`${app.url}/api/auth/request-password-reset`, {
          method: "POST",
          headers: { "content-type": "application/json", origin: config.appUrl, "x-forwarded-for": client },
          body: JSON.stringify({ email: email(`victim-${i}`), redirectTo: "/reset-password" }),
        });
        statuses.push(r.status);
      }
      expect(statuses).toEqual([...Array(RESET_REQUEST_RATE_LIMIT.max).fill(200), 429]);
    } finally {
      await app.close();
    }
  });
});

describe("reset e-mails per account", () => {
  it(`at most ${RESET_MAILS_PER_ACCOUNT.max} in ${RESET_MAILS_PER_ACCOUNT.window / 60} minutes to one account, whoever asks; the answer does not change`, async () => {
    await signUpAndIn("mailbombed");
    const to = email("mailbombed");
    for (let i = 0; i < RESET_MAILS_PER_ACCOUNT.max + 2; i++) {
      const r = await auth.api.requestPasswordReset({ body: { email: to, redirectTo: "/reset-password" } });
      expect(r.status).toBe(true);
    }
    await waitForMail(to, /Reset your Lapbench password/);
    await new Promise((r) => setTimeout(r, 1000)); // let any further mail arrive
    const resets = inbox.filter((m) => m.to && !Array.isArray(m.to) && m.to.value.some((a) => a.address === to) && /Reset your/.test(m.subject ?? ""));
    expect(resets).toHaveLength(RESET_MAILS_PER_ACCOUNT.max);
  });
});

describe("invitations need a confirmed, matching address", () => {
  it("refuses an unconfirmed invitee and another address; accepts after the mailed confirmation link", async () => {
    const owner = await signUpAndIn("owner");
    const team = await auth.api.createOrganization({ body: { name: `Team ${run}`, slug: `team-${run}` }, headers: owner.headers });
    const invitee = email("invitee");
    const inv = await auth.api.createInvitation({ body: { email: invitee, role: "engineer", organizationId: team!.id }, headers: owner.headers });

    // Someone else (confirmed or not) cannot take the role.
    const other = await signUpAndIn("squatter");
    await expect(auth.api.acceptInvitation({ body: { invitationId: inv.id }, headers: other.headers })).rejects.toMatchObject({ statusCode: 403 });

    // The invited address, signed up but not confirmed: refused.
    const me = await signUpAndIn("invitee");
    await expect(auth.api.acceptInvitation({ body: { invitationId: inv.id }, headers: me.headers })).rejects.toMatchObject({
      statusCode: 403,
      body: { code: "EMAIL_VERIFICATION_REQUIRED_BEFORE_ACCEPTING_OR_REJECTING_INVITATION" },
    });

    // The confirmation link from the sign-up mail.
    const mail = await waitForMail(invitee, /Confirm your Lapbench e-mail address/);
    const link = mail.text!.match(/https?:\/\/\S+/)![0];
    expect(link.startsWith(`${config.appUrl}/api/auth/verify-email?token=`)).toBe(true);
    const verified = await auth.handler(new Request(link));
    expect([200, 302]).toContain(verified.status);
    const row = at(await db.query<{ emailVerified: number }>("SELECT emailVerified FROM user WHERE id = ?", { replacements: [me.userId], type: QueryTypes.SELECT }), 0);
    expect(Number(row.emailVerified)).toBe(1);

    const { headers } = await auth.api.signInEmail({ body: { email: invitee, password: PASSWORD }, returnHeaders: true });
    const accepted = await auth.api.acceptInvitation({ body: { invitationId: inv.id }, headers: cookieHeaders(headers) });
    expect(accepted?.member.role).toBe("engineer");
    const members = await db.query<{ userId: string }>("SELECT userId FROM member WHERE organizationId = ?", { replacements: [team!.id], type: QueryTypes.SELECT });
    expect(members.map((m) => m.userId).sort()).toEqual([owner.userId, me.userId].sort());
  });
});

describe("sessions", () => {
  it("last 7 days, and a password reset ends every session of the account", async () => {
    const a = await signUpAndIn("resetter");
    await auth.api.signInEmail({ body: { email: email("resetter"), password: PASSWORD } }); // a second device
    const rows = await db.query<{ expiresAt: Date; createdAt: Date }>("SELECT expiresAt, createdAt FROM session WHERE userId = ?", { replacements: [a.userId], type: QueryTypes.SELECT });
    expect(rows.length).toBeGreaterThanOrEqual(2); // sign-up, sign-in, a second device
    for (const r of rows) expect((new Date(r.expiresAt).getTime() - new Date(r.createdAt).getTime()) / 1000).toBeCloseTo(SESSION_EXPIRES_S, -1);

    await auth.api.requestPasswordReset({ body: { email: email("resetter"), redirectTo: "/reset-password" } });
    const link = (await waitForMail(email("resetter"), /Reset your Lapbench password/)).text!.match(/https?:\/\/\S+/)![0];
    await auth.api.resetPassword({ body: { token: new URL(link).pathname.split("/").pop()!, newPassword: "new-fork-seal-2410" } });
    const left = await db.query("SELECT id FROM session WHERE userId = ?", { replacements: [a.userId], type: QueryTypes.SELECT });
    expect(left).toEqual([]);
    expect(await auth.api.getSession({ headers: a.headers, query: { disableCookieCache: true } })).toBeNull();
  });
});

describe("upload grants in the database", () => {
  it("name the uploader, complete one file once, and expire", async () => {
    const grants = dbUploadGrants(() => db);
    const g = await grants.issue({ teamId: "team-x", userId: "user-y" });
    expect(g).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(await grants.redeem("forged", "k1")).toBeNull();
    expect(await grants.redeem(g, "k1")).toEqual({ teamId: "team-x", userId: "user-y" });
    expect(await grants.redeem(g, "k2")).toBeNull();

    const old = await grants.issue({ teamId: "team-x", userId: "user-y" });
    await db.query("UPDATE upload_grants SET expires_at = CURRENT_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE id = ?", { replacements: [old], type: QueryTypes.UPDATE });
    expect(await grants.redeem(old, "k3")).toBeNull();
  });
});
