import "server-only";
/** The app's upload route: engineers and owners of the active team; a stored file becomes a Session. */
import { createLogFileRouter, uploadDenied } from "./file-router";
import { requireTeam } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { registerTeamUpload } from "@/lib/data/imports";
import { appUploadGrants } from "@/lib/data/upload-grants";
import { storageOrigins } from "./storage-origins";

export const logFileRouter = createLogFileRouter({
  async authorize(req) {
    try {
      const ctx = await requireTeam(req.headers, { permission: { "session-data": ["upload"] } });
      return { userId: ctx.userId, teamId: ctx.teamId };
    } catch (e) {
      if (e instanceof HttpError) throw uploadDenied(e.status === 401 ? "Sign in to upload logs." : "Only engineers and owners of this team upload logs.");
      throw e;
    }
  },
  grants: appUploadGrants(),
  fileOrigins: () => storageOrigins(),
  // metadata: the uploader recorded in the grant, never the callback body.
  async onComplete({ metadata, file }) {
    return registerTeamUpload({ teamId: metadata.teamId, userId: metadata.userId, file });
  },
});

export type AppLogFileRouter = typeof logFileRouter;
