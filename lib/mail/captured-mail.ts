import "server-only";
/**
 * Reads the messages kept by the local SMTP fake (workers/services/mail-fake.ts): the development
 * mail page lists them, and end-to-end tests follow invitation and reset links from them.
 */
import fs from "node:fs/promises";
import path from "node:path";
import { mailDir } from "../config";

export interface CapturedMail {
  id: string;
  /** Epoch ms when the fake received it (message Date headers can be absent or skewed). */
  receivedAt: number;
  from: string;
  /** Header To addresses, lower-case. */
  to: string[];
  /** SMTP RCPT TO addresses, lower-case: includes Bcc recipients. */
  envelopeTo: string[];
  subject: string;
  text: string;
  html: string | null;
  date: string | null;
  /** http(s) links in the text body (or in the HTML when there is no text part), in order. */
  links: string[];
  /** File name of the raw message next to the JSON. */
  eml: string;
}

export async function listCapturedMail(dir: string = mailDir()): Promise<CapturedMail[]> {
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") return []; // nothing sent yet
    throw e;
  }
  const mails = await Promise.all(
    names.map(async (n) => JSON.parse(await fs.readFile(path.join(dir, n), "utf8")) as CapturedMail),
  );
  return mails.sort((a, b) => b.receivedAt - a.receivedAt || b.id.localeCompare(a.id));
}

export async function findLatestMailTo(address: string, dir: string = mailDir()): Promise<CapturedMail | undefined> {
  const wanted = address.trim().toLowerCase();
  return (await listCapturedMail(dir)).find((m) => m.to.includes(wanted) || m.envelopeTo.includes(wanted));
}
