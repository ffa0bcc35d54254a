/**
 * The better-auth options every Lapbench auth instance shares (the Next route's `auth` and the
 * scripts'/tests' `createAuth`). The database, secret and base URL are added by the callers, so
 * importing this file reads no secrets and opens no connection.
 */
import type { BetterAuthOptions } from "better-auth";
import { organization } from "better-auth/plugins/organization";
import { config } from "../config";
import { ac, roles } from "./permissions";

export const MIN_PASSWORD_LENGTH = 10;
export const INVITATION_EXPIRES_S = 7 * 24 * 60 * 60;
/** A session lasts 7 days and is extended (at most once a day) while it is used. */
export const SESSION_EXPIRES_S = 7 * 24 * 60 * 60;
export const SESSION_UPDATE_AGE_S = 24 * 60 * 60;
/** Password-reset requests: 3 per 15 minutes per client address (each one sends an e-mail). */
export const RESET_REQUEST_RATE_LIMIT = { window: 15 * 60, max: 3 };
/** And at most 3 reset e-mails per 15 minutes to one account, from any number of addresses. */
export const RESET_MAILS_PER_ACCOUNT = { window: 15 * 60, max: 3 };

/**
 * Reset links issued to this user in the last window (better-auth stores each as a verification
 * row "reset-password:<token>" whose value is the user id, before it asks us to mail it).
 */
async function recentResetLinks(userId: string): Promise<number> {
  const { getSequelize } = await import("../../models/db");
  const { QueryTypes } = await import("sequelize");
  const rows = await getSequelize().query<{ createdAt: Date }>(
    "SELECT createdAt FROM verification WHERE value = ? AND identifier LIKE 'reset-password:%'",
    { replacements: [userId], type: QueryTypes.SELECT },
  );
  const since = Date.now() - RESET_MAILS_PER_ACCOUNT.window * 1000;
  return rows.filter((r) => new Date(r.createdAt).getTime() > since).length;
}
// 10 attempts a minute per client address. The end-to-end suite signs in dozens of times a minute
// from one address, so its stack raises the ceiling through LAPBENCH_SIGNIN_RATE_MAX.
export const SIGN_IN_RATE_LIMIT = { window: 60, max: Number(process.env.LAPBENCH_SIGNIN_RATE_MAX ?? 10) || 10 };

/** The accept link in invitation e-mails; app/accept-invitation/[id] handles it. */
export function invitationUrl(invitationId: string): string {
  return `${config.appUrl}/accept-invitation/${encodeURIComponent(invitationId)}`;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

// Imported on use: send-mail is server-only, and scripts that never send mail (seeding) must not
// need the Next server build conditions just to load the auth options.
async function mail(to: string, subject: string, text: string, linkUrl: string, linkLabel: string) {
  const { sendMail } = await import("../mail/send-mail");
  const html = `<p>${escapeHtml(text.split("\n")[0] ?? "")}</p><p><a href="${escapeHtml(linkUrl)}">${escapeHtml(linkLabel)}</a></p>`;
  await sendMail({ to, subject, text, html });
}

// Secure cookies whenever the public URL (BETTER_AUTH_URL) is https. The demo runs `next start`
// on http://localhost, where a Secure cookie would never come back and nobody could stay signed in.
export const secureCookiesFor = (appUrl: string = config.appUrl) => appUrl.startsWith("https://");

export const authOptions = {
  appName: "Lapbench",
  emailAndPassword: {
    enabled: true,
    minPasswordLength: MIN_PASSWORD_LENGTH,
    // A reset ends every session of the account: whoever knew the old password is signed out.
    revokeSessionsOnPasswordReset: true,
    async sendResetPassword({ user, url }) {
      // Past the per-account limit the request still answers as usual (no hint whether the
      // address exists) but no further e-mail goes out.
      if ((await recentResetLinks(user.id)) > RESET_MAILS_PER_ACCOUNT.max) return;
      await mail(
        user.email,
        "Reset your Lapbench password",
        `Someone asked to reset the password of your Lapbench account. If it was you, open this link (valid for one hour):\n${url}\nIf not, ignore this e-mail.`,
        url,
        "Choose a new password",
      );
    },
  },
  // Addresses are confirmed through a mailed link (the local mail service in a demo); a team
  // invitation can only be accepted by a confirmed address that matches it.
  emailVerification: {
    sendOnSignUp: true,
    autoSignInAfterVerification: true,
    expiresIn: 24 * 60 * 60,
    async sendVerificationEmail({ user, url }) {
      await mail(
        user.email,
        "Confirm your Lapbench e-mail address",
        `Open this link to confirm ${user.email} for your Lapbench account (valid for 24 hours):\n${url}\nIf you did not create an account, ignore this e-mail.`,
        url,
        "Confirm my address",
      );
    },
  },
  session: {
    expiresIn: SESSION_EXPIRES_S,
    updateAge: SESSION_UPDATE_AGE_S,
    // The session row and its user, signed (HMAC with the auth secret) into a short-lived
    // session_data cookie, so a request's guard skips two database reads. It is checked against
    // the signed session_token cookie on every read. Team membership and role are NOT in it:
    // lib/auth/guard.ts reads them live on every request, so a removed member or a changed role
    // takes effect at once. Sign-out clears both cookies in that browser; a session revoked
    // elsewhere (sign-out on another device, password reset) stays usable by a copy of its cookies
    // for at most maxAge — kept to one minute for that reason. refreshCache stays off (better-auth
    // disables it with a database anyway), so the cache never outlives maxAge without a database read.
    cookieCache: { enabled: true, maxAge: 60 },
  },
  rateLimit: {
    enabled: true,
    // In the database so the limit holds across the web process and any other process.
    storage: "database",
    customRules: {
      "/sign-in/email": SIGN_IN_RATE_LIMIT,
      "/request-password-reset": RESET_REQUEST_RATE_LIMIT,
      "/send-verification-email": RESET_REQUEST_RATE_LIMIT,
    },
  },
  advanced: {
    useSecureCookies: secureCookiesFor(),
    // The client address is X-Forwarded-For as rewritten in the web server process
    // (workers/services/peer-address.mjs): the TCP peer, or the client behind a TRUSTED_PROXY.
    ipAddress: { ipAddressHeaders: ["x-forwarded-for"] },
    defaultCookieAttributes: { sameSite: "lax", httpOnly: true },
  },
  trustedOrigins: [...new Set([config.appUrl, `http://127.0.0.1:${config.appPort}`, `http://localhost:${config.appPort}`])],
  plugins: [
    organization({
      ac,
      roles,
      creatorRole: "owner",
      requireEmailVerificationOnInvitation: true,
      invitationExpiresIn: INVITATION_EXPIRES_S,
      async sendInvitationEmail({ id, email, role, organization: team, inviter }) {
        const url = invitationUrl(id);
        await mail(
          email,
          `Join ${team.name} on Lapbench`,
          `${inviter.user.name} invited you to the team "${team.name}" on Lapbench as ${role}. Accept within 7 days:\n${url}`,
          url,
          "Accept the invitation",
        );
      },
    }),
  ],
} satisfies BetterAuthOptions;
