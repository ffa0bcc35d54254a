/**
 * The session-signing secret. A production server refuses to start without a strong one: with a
 * known key anyone can sign a session cookie (and the cookie cache) for any user id.
 * Plain Node: used by the start script, the Next server's instrumentation hook and tests.
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";

/** The value development and tests run with when BETTER_AUTH_SECRET is not set. Never valid in production. */
export const DEV_AUTH_SECRET = "lapbench-development-secret-change-me-in-production-0123456789";
export const MIN_AUTH_SECRET_BYTES = 32;
export const AUTH_SECRET_FILE = "auth-secret";

/** Why this secret must not sign production sessions, or null when it may. */
export function authSecretProblem(secret: string | undefined): string | null {
  if (secret === undefined || secret.trim() === "") return "BETTER_AUTH_SECRET is not set";
  if (secret === DEV_AUTH_SECRET) return "BETTER_AUTH_SECRET is the development value that ships with the code";
  const bytes = Buffer.byteLength(secret, "utf8");
  if (bytes < MIN_AUTH_SECRET_BYTES) return `BETTER_AUTH_SECRET is ${bytes} bytes long; it needs at least ${MIN_AUTH_SECRET_BYTES}`;
  return null;
}

/** Throws a clear error when a production server would run with a weak secret. */
export function assertProductionAuthSecret(secret: string | undefined): void {
  const problem = authSecretProblem(secret);
  if (problem) {
    throw new Error(
      `${problem}. Lapbench will not serve a production build with it: anyone who knows the key can sign in as anyone. ` +
        `Set BETTER_AUTH_SECRET to a random value of ${MIN_AUTH_SECRET_BYTES} bytes or more (for example \`openssl rand -base64 48\`), ` +
        "or start with `npm start`, which generates one and keeps it in the data folder.",
    );
  }
}

/**
 * A random secret generated on first start and kept (mode 0600) in the data folder, which is
 * git-ignored; later starts reuse it, so sessions survive a restart.
 */
export function loadOrCreateSecretFile(dataDir: string, fileName: string, make: () => string): string {
  const file = path.join(dataDir, fileName);
  try {
    const existing = fs.readFileSync(file, "utf8").trim();
    if (existing) return existing;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "ENOENT") throw e;
  }
  fs.mkdirSync(dataDir, { recursive: true });
  const value = make();
  // wx: two processes starting at once never overwrite each other's secret.
  try {
    fs.writeFileSync(file, value + "\n", { mode: 0o600, flag: "wx" });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "EEXIST") return fs.readFileSync(file, "utf8").trim();
    throw e;
  }
  return value;
}

/** BETTER_AUTH_SECRET from the environment when set, otherwise the install's stored random secret. */
export function resolveAuthSecret(env: NodeJS.ProcessEnv, dataDir: string): string {
  if (env.BETTER_AUTH_SECRET) return env.BETTER_AUTH_SECRET;
  return loadOrCreateSecretFile(dataDir, AUTH_SECRET_FILE, () => randomBytes(48).toString("base64url"));
}
