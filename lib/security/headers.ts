/**
 * The security headers every response carries (applied in next.config.ts). Plain data so a test
 * can check them without a build.
 *
 * Script policy: Next.js's App Router inlines its bootstrap scripts, so production needs
 * 'unsafe-inline' (or per-request nonces); it never needs 'unsafe-eval' (only `next dev` does,
 * for React's debugging). The upload service is contacted straight from the browser (the file
 * goes to a presigned URL on it), so its origin is in connect-src.
 */
export interface SecurityHeaderOptions {
  /** `next dev` (adds 'unsafe-eval', which React's development build needs). */
  dev: boolean;
  /** The app's public URL (BETTER_AUTH_URL): https turns on HSTS. */
  appUrl: string;
  /** Origins the browser may send uploads to (the upload service). */
  uploadOrigins: string[];
}

export function contentSecurityPolicy(o: SecurityHeaderOptions): string {
  const connect = ["'self'", ...o.uploadOrigins].join(" ");
  return [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${o.dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self' data:",
    `connect-src ${connect}`,
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(o.appUrl.startsWith("https://") ? ["upgrade-insecure-requests"] : []),
  ].join("; ");
}

export function securityHeaders(o: SecurityHeaderOptions): { key: string; value: string }[] {
  const h = [
    { key: "Content-Security-Policy", value: contentSecurityPolicy(o) },
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
    { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  ];
  // HSTS only means something over https; on http://localhost it would be ignored at best.
  if (o.appUrl.startsWith("https://")) h.push({ key: "Strict-Transport-Security", value: "max-age=63072000; includeSubDomains" });
  return h;
}

/** Origins of the upload service the browser talks to, from the SDK's environment. */
export function uploadOriginsFromEnv(env: NodeJS.ProcessEnv): string[] {
  const out = new Set<string>();
  for (const v of [env.UPLOADTHING_INGEST_URL]) {
    if (!v) continue;
    try {
      out.add(new URL(v).origin);
    } catch {
      /* a malformed URL is reported by the SDK itself */
    }
  }
  // The hosted service's ingest hosts when no local one is configured.
  if (out.size === 0) out.add("https://*.ingest.uploadthing.com");
  return [...out];
}
