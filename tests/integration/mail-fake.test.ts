// The local SMTP fake keeps what nodemailer sends, and captured-mail reads it back parsed.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import nodemailer, { type Transporter } from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startMailFake, type MailFake } from "../../workers/services/mail-fake";
import { findLatestMailTo, listCapturedMail } from "../../lib/mail/captured-mail";
import { at } from "../fixtures/at";

let fake: MailFake;
let dir: string;
let transport: Transporter;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-mail-"));
  fake = await startMailFake({ port: 0, dir }); // a free port: the dev fake may hold 2525
  transport = nodemailer.createTransport({ host: "127.0.0.1", port: fake.port, secure: false, ignoreTLS: true });
});

afterAll(async () => {
  transport?.close();
  await fake?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("mail fake", () => {
  it("keeps a plain-text message as .eml and parsed JSON, with its links", async () => {
    await transport.sendMail({
      from: "Lapbench <no-reply@lapbench.invalid>",
      to: "Rider.One@team-falcon.invalid",
      subject: "You are invited to Team Falcon",
      text: "Join the team here: http://localhost:3000/invite/abc123?x=1&y=2.\nThanks.",
    });
    const mails = await listCapturedMail(dir);
    expect(mails).toHaveLength(1);
    const m = at(mails, 0);
    expect(m.subject).toBe("You are invited to Team Falcon");
    expect(m.to).toEqual(["rider.one@team-falcon.invalid"]);
    expect(m.from).toContain("no-reply@lapbench.invalid");
    expect(m.text).toContain("Join the team here");
    expect(m.html).toBeNull();
    expect(m.links).toEqual(["http://localhost:3000/invite/abc123?x=1&y=2"]);
    expect(fs.readFileSync(path.join(dir, m.eml), "utf8")).toContain("Subject: You are invited to Team Falcon");
  });

  it("parses an HTML message with a link, lists newest first and finds the latest per address", async () => {
    await transport.sendMail({
      from: "Lapbench <no-reply@lapbench.invalid>",
      to: "crew.chief@team-falcon.invalid",
      bcc: "audit@lapbench.invalid",
      subject: "Session ready: Practice 2",
      html: '<p>Your brief is ready: <a href="http://localhost:3000/sessions/42/brief?tab=laps&amp;lap=3">open it</a></p>',
    });
    const mails = await listCapturedMail(dir);
    expect(mails.map((m) => m.subject)).toEqual(["Session ready: Practice 2", "You are invited to Team Falcon"]);
    const m = at(mails, 0);
    expect(m.html).toContain("<a href=");
    expect(m.links).toContain("http://localhost:3000/sessions/42/brief?tab=laps&lap=3");
    expect(m.date).toMatch(/^\d{4}-\d\d-\d\dT/);

    expect((await findLatestMailTo("CREW.CHIEF@team-falcon.invalid", dir))?.subject).toBe("Session ready: Practice 2");
    // Bcc recipients only appear in the SMTP envelope.
    expect((await findLatestMailTo("audit@lapbench.invalid", dir))?.subject).toBe("Session ready: Practice 2");
    expect(await findLatestMailTo("nobody@lapbench.invalid", dir)).toBeUndefined();
  });

  it("reads an empty list when nothing was ever sent", async () => {
    expect(await listCapturedMail(path.join(dir, "never-created"))).toEqual([]);
  });
});
