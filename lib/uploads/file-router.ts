/**
 * The uploadthing FileRouter for data-logger exports. Authorisation and what happens after an
 * upload are injected, so the same router runs in the Next route, in the contract test against
 * the local upload fake, and in unit tests with msw standing in for the hosted service.
 */
import { createUploadthing, UploadThingError, type FileRouter } from "uploadthing/server";
import { getStatusCodeFromError, type FileSize } from "@uploadthing/shared";
import { assertUploadServiceAnswers } from "./upload-service-check";

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

export interface LogFileRouterDeps {
  /** Returns who uploads for which team, or throws (use `uploadDenied`). */
  authorize(req: Request): Promise<Uploader> | Uploader;
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
          if (!isLogFileName(file.name)) {
            throw new UploadThingError({
              code: "BAD_REQUEST",
              message: `"${file.name}" is not a log file Lapbench can read: use ${LOG_FILE_EXTENSIONS.join(", ")} (CSV, GPX or NMEA)`,
            });
          }
        }
        await assertUploadServiceAnswers();
        return { userId: who.userId, teamId: who.teamId };
      })
      .onUploadComplete(async ({ metadata, file }) => {
        const { key, name, size, ufsUrl, fileHash } = file;
        const { sessionId } = await deps.onComplete({ metadata, file: { key, name, size, ufsUrl, fileHash } });
        return { sessionId };
      }),
  } satisfies FileRouter;
}

export type LogFileRouter = ReturnType<typeof createLogFileRouter>;
