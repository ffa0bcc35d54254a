import "server-only";
/**
 * Outgoing e-mail (invitations, password reset, "session ready") through nodemailer to the SMTP
 * server in config.smtp — in development and tests, the local fake in workers/services/mail-fake.ts.
 */
import nodemailer from "nodemailer";
import { config } from "../config";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

let transport: ReturnType<typeof nodemailer.createTransport> | undefined;

export async function sendMail(mail: OutgoingMail): Promise<void> {
  transport ??= nodemailer.createTransport({
    host: config.smtp.host,
    port: config.smtp.port,
    secure: false,
    ignoreTLS: true,
  });
  await transport.sendMail({ from: config.smtp.from, ...mail });
}
