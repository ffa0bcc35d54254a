/**
 * Ports, paths and secrets for every Lapbench process, read from the environment with
 * development defaults. One place, so the start script, the worker, the fakes and the tests agree.
 */
import path from "node:path";
import { DEV_AUTH_SECRET } from "./security/auth-secret";

const root = process.env.LAPBENCH_ROOT ?? process.cwd();

function int(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0) throw new Error(`${name} must be a positive integer, got "${raw}"`);
  return n;
}

export const config = {
  root,
  dataDir: process.env.LAPBENCH_DATA_DIR ?? path.join(root, ".data"),
  db: {
    // Another machine when deploying past one; the private server the start script runs listens on 127.0.0.1 only.
    host: process.env.LAPBENCH_DB_HOST ?? "127.0.0.1",
    port: int("LAPBENCH_DB_PORT", 3407),
    name: process.env.LAPBENCH_DB_NAME ?? "lapbench",
    user: process.env.LAPBENCH_DB_USER ?? "lapbench",
    password: process.env.LAPBENCH_DB_PASSWORD ?? "lapbench-local-only",
  },
  appPort: int("PORT", 3000),
  appUrl: process.env.BETTER_AUTH_URL ?? process.env.LAPBENCH_APP_URL ?? `http://localhost:${int("PORT", 3000)}`,
  /** The interface the web app listens on: loopback unless HOST says otherwise. */
  host: process.env.HOST || "127.0.0.1",
  // Development and tests only: a production server refuses this value (instrumentation.ts).
  authSecret: process.env.BETTER_AUTH_SECRET || DEV_AUTH_SECRET,
  smtp: {
    // The local mail service unless a real SMTP host is configured (then /dev/mail is off).
    host: process.env.LAPBENCH_SMTP_HOST || "127.0.0.1",
    port: int("LAPBENCH_SMTP_PORT", 2525),
    from: process.env.LAPBENCH_MAIL_FROM ?? "Lapbench <no-reply@lapbench.invalid>",
  },
  uploadFake: {
    port: int("LAPBENCH_UPLOAD_PORT", 4100),
  },
};

export function mailDir(): string {
  return path.join(config.dataDir, "mail");
}
