/**
 * A local SMTP server that keeps every message instead of delivering it: `<id>.eml` (raw) and
 * `<id>.json` (parsed, see CapturedMail). The app sends to it in development and tests; the
 * development mail page and e2e tests read it back through lib/mail/captured-mail.ts.
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs/promises";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";
import { config, mailDir } from "../../lib/config";
import type { CapturedMail } from "../../lib/mail/captured-mail";

export interface MailFakeOptions {
  port: number;
  dir?: string;
  host?: string;
}
export interface MailFake {
  port: number;
  close(): Promise<void>;
}

const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;
const LINK_RE = /https?:\/\/[^\s<>"'`)\]]+/g;

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((a) => a.value.map((v) => (v.address ?? "").toLowerCase())).filter(Boolean);
}

function findLinks(text: string): string[] {
  // Trailing sentence punctuation is not part of a link.
  return [...new Set((text.match(LINK_RE) ?? []).map((l) => l.replace(/[.,;:!?]+$/, "")))];
}

export async function startMailFake(opts: MailFakeOptions): Promise<MailFake> {
  const dir = opts.dir ?? mailDir();
  await fs.mkdir(dir, { recursive: true });
  let seq = 0;

  async function keep(raw: Buffer, envelopeTo: string[]): Promise<void> {
    const receivedAt = Date.now();
    // Sortable by name, unique within one process and across restarts.
    const id = `${receivedAt}-${String(seq++).padStart(4, "0")}-${randomBytes(3).toString("hex")}`;
    const parsed = await simpleParser(raw);
    const text = parsed.text ?? "";
    const html = typeof parsed.html === "string" ? parsed.html : null;
    const mail: CapturedMail = {
      id,
      receivedAt,
      from: parsed.from?.text ?? "",
      to: addresses(parsed.to),
      envelopeTo,
      subject: parsed.subject ?? "",
      text,
      html,
      date: parsed.date ? parsed.date.toISOString() : null,
      links: findLinks(text || (html ?? "").replace(/&amp;/g, "&")),
      eml: `${id}.eml`,
    };
    await fs.writeFile(path.join(dir, mail.eml), raw);
    // Write then rename, so a reader never sees half a JSON file.
    await fs.writeFile(path.join(dir, `${id}.json.tmp`), JSON.stringify(mail, null, 2));
    await fs.rename(path.join(dir, `${id}.json.tmp`), path.join(dir, `${id}.json`));
  }

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: MAX_MESSAGE_BYTES,
    closeTimeout: 1_000, // stopping the dev servers should not hang on an idle client
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        if (stream.sizeExceeded) {
          return callback(Object.assign(new Error(`Message exceeds ${MAX_MESSAGE_BYTES} bytes`), { responseCode: 552 }));
        }
        const rcpt = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
        keep(Buffer.concat(chunks), rcpt).then(() => callback(), (e: Error) => callback(e));
      });
    },
  });

  const host = opts.host ?? "127.0.0.1";
  await new Promise<void>((ok, fail) => {
    server.once("error", fail);
    server.listen(opts.port, host, () => ok());
  });
  const port = (server.server.address() as { port: number }).port;
  return {
    port,
    close: () => new Promise<void>((ok) => server.close(() => ok())),
  };
}

// CLI: `npx tsx workers/services/mail-fake.ts` (used by the start script).
if (process.argv[1] && /mail-fake\.ts$/.test(process.argv[1])) {
  startMailFake({ port: config.smtp.port }).then((fake) => {
    console.log(`[mail-fake] SMTP on 127.0.0.1:${fake.port}, messages in ${mailDir()}`);
    const stop = () => void fake.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  });
}
