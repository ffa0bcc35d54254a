/**
 * Sends a message rendered from React components: the HTML part and the plain-text part both come
 * from @react-email/render, so the two always say the same. No "server-only" here: the ingest
 * worker sends "session ready" mail too. nodemailer to config.smtp (the local fake in development
 * and tests).
 */
import type { ReactElement } from "react";
import nodemailer from "nodemailer";
import { render } from "@react-email/render";
import { config } from "../config";

export interface RenderedMail {
  html: string;
  text: string;
}

export async function renderMail(element: ReactElement): Promise<RenderedMail> {
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { html, text };
}

let transport: ReturnType<typeof nodemailer.createTransport> | undefined;

export async function deliverMail(to: string, subject: string, element: ReactElement): Promise<RenderedMail> {
  const rendered = await renderMail(element);
  transport ??= nodemailer.createTransport({ host: config.smtp.host, port: config.smtp.port, secure: false, ignoreTLS: true, connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10000 });
  await transport.sendMail({ from: config.smtp.from, to, subject, text: rendered.text, html: rendered.html });
  return rendered;
}
