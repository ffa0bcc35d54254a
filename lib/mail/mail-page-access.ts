/**
 * Who may read the captured-mail page (/dev/mail). It shows password-reset and invitation links, so
 * it is served only when all hold: the start script runs the local mail service
 * (LAPBENCH_MAIL_PAGE=1), no real SMTP host is configured, and the request comes from this machine.
 */
import { config } from "../config";
import { clientAddressOf, isLoopbackAddress } from "../security/client-address";

export function isLocalMailService(smtpHost: string = config.smtp.host, env: NodeJS.ProcessEnv = process.env): boolean {
  return env.LAPBENCH_MAIL_PAGE === "1" && (smtpHost === "127.0.0.1" || smtpHost === "localhost" || smtpHost === "::1");
}

export function mayReadCapturedMail(headers: Headers, smtpHost?: string, env?: NodeJS.ProcessEnv): boolean {
  return isLocalMailService(smtpHost, env) && isLoopbackAddress(clientAddressOf(headers));
}
