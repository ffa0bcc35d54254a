/**
 * The uploadthing FileRouter for data-logger exports. Authorisation and what happens after an
 * upload are injected, so the same router runs in the Next route, in the contract test against
 * the local upload fake, and in unit tests with msw standing in for the hosted service.
 */
import { createUploadthing, UploadThingError, type FileRouter } from "uploadthing/server";
import { getStatusCodeFromError, type FileSize } from "@uploadthing/shared";
import { assertUploadServiceAnswers } from "./upload-service-check";
import { GPX_MAX_BYTES } from "../ingest/limits";

export interface Uploader {
  userId: string;
  teamId: string;
}

export interface CompletedLogFile {
  key: string;
  name: string;
  size: number;
  ufsUrl: string;
  fileHash: string;
}

/**
 * Who may complete an upload, kept on the server. The upload service only ever carries the grant's
 * random id back in the completion callback: team and user are never taken from the callback body,
 * so whoever can sign a callback still cannot plant a session in another team.
 */
export interface UploadGrantStore {
  issue(who: Uploader): Promise<string>;
  /** The uploader of an unused, unexpired grant (marking it used), or null. */
  redeem(grant: string, fileKey: string): Promise<Uploader | null>;
}

/** A grant store in memory: for tests of the router without a database. */
export function memoryGrantStore(): UploadGrantStore & { size(): number } {
  const grants = new Map<string, Uploader>();
  let n = 0;
  return {
    async issue(who) {
      const id = `grant-${++n}-${Math.random().toString(36).slice(2)}`;
      grants.set(id, who);
      return id;
    },
    async redeem(grant) {
      const who = grants.get(grant) ?? null;
      grants.delete(grant);
      return who;
    },
    size: () => grants.size,
  };
}

/**
 * A stored file's URL is only fetched by the server when it points at the configured storage
 * service: one of `origins`, path `/f/<the file's key>`. Anything else (another host, a local
 * address, credentials in the URL) would make the server fetch what a forged callback names.
 */
export function isStoredFileUrl(url: string, key: string, origins: readonly string[]): boolean {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return false;
  }
  if (u.username || u.password || u.search || u.hash) return false;
  if (u.protocol !== "http:" && u.protocol !== "https:") return false;
  return origins.includes(u.origin) && u.pathname === `/f/${encodeURIComponent(key)}`;
}

export interface LogFileRouterDeps {
  /** Returns who uploads for which team, or throws (use `uploadDenied`). */
  authorize(req: Request): Promise<Uploader> | Uploader;
  grants: UploadGrantStore;
  /** Origins of the storage service whose file URLs are accepted. */
  fileOrigins(): readonly string[];
  /** Creates the session for the stored file; its id goes back to the browser as serverData. */
  onComplete(args: { metadata: Uploader; file: CompletedLogFile }): Promise<{ sessionId: number }>;
  /** Only tests lower this; the product limit is 512 MB. */
  maxFileSize?: FileSize;
}

export const LOG_FILE_MAX_SIZE: FileSize = "512MB";
/**
 * Browsers report CSV/GPX/NMEA types inconsistently (often empty or application/octet-stream),
 * so the route takes any "blob" and the extension decides; the parser checks the content.
 */
export const LOG_FILE_EXTENSIONS = [".csv", ".tsv", ".txt", ".log", ".gpx", ".nmea", ".nma"] as const;

export function isLogFileName(name: string): boolean {
  const lower = name.toLowerCase();
  return LOG_FILE_EXTENSIONS.some((ext) => lower.endsWith(ext));
}

/**
 * The error for "not signed in" and "not a member of this team". uploadthing 7 has no
 * UNAUTHORIZED code: FORBIDDEN (403) is the one the browser client reports as a refusal.
 */
export function uploadDenied(message: string): UploadThingError {
  return new UploadThingError({ code: "FORBIDDEN", message });
}

async function authorizeOrDeny(deps: LogFileRouterDeps, req: Request): Promise<Uploader> {
  try {
    return await deps.authorize(req);
  } catch (e) {
    // An UploadThingError with a code v7 does not know is answered "200 OK" with the error as the
    // body, and the browser then silently uploads nothing: turn it into a refusal.
    if (e instanceof UploadThingError && getStatusCodeFromError(e) === undefined) throw uploadDenied(e.message);
    throw e;
  }
}

export function createLogFileRouter(deps: LogFileRouterDeps) {
  const f = createUploadthing();
  return {
    logFile: f({ blob: { maxFileSize: deps.maxFileSize ?? LOG_FILE_MAX_SIZE, maxFileCount: 1 } })
      .middleware(async ({ req, files }) => {
        // Authorise first: an anonymous caller learns nothing about what is accepted.
        const who = await authorizeOrDeny(deps, req);
        for (const file of files) {
          if (file.name.toLowerCase().endsWith(".gpx") && file.size > GPX_MAX_BYTES) {
            throw new UploadThingError({
              code: "BAD_REQUEST",
              message: `"${file.name}" is ${(file.size / 1048576).toFixed(1)} MiB; a GPX file is read whole, so the limit is ${GPX_MAX_BYTES / 1048576} MiB. Split the track, or export it as NMEA 0183 or CSV.`,
            });
          }
          if (!isLogFileName(file.name)) {
            throw new UploadThingError({
              code: "BAD_REQUEST",
              message: `"${file.name}" is not a log file Lapbench can read: use ${LOG_FILE_EXTENSIONS.join(", ")} (CSV, GPX or NMEA)`,
            });
          }
        }
        await assertUploadServiceAnswers();
        return { grant: await deps.grants.issue({ userId: who.userId, teamId: who.teamId }) };
      })
      .onUploadComplete(async ({ metadata, file }) => {
        const { key, name, size, ufsUrl, fileHash } = file;
        if (!isStoredFileUrl(ufsUrl, key, deps.fileOrigins())) {
          throw new Error(`Refused an upload callback whose file URL is not on the storage service: ${String(ufsUrl).slice(0, 200)}`);
        }
        const who = typeof metadata?.grant === "string" ? await deps.grants.redeem(metadata.grant, key) : null;
        if (!who) throw new Error("Refused an upload callback without a valid, unused upload grant");
        const { sessionId } = await deps.onComplete({ metadata: who, file: { key, name, size, ufsUrl, fileHash } });
        return { sessionId };
      }),
  } satisfies FileRouter;
}

export type LogFileRouter = ReturnType<typeof createLogFileRouter>;
