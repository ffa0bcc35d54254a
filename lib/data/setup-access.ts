import "server-only";
/** Shared checks of the setup screens (tracks, bikes, engines, events): who may change them. */
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { forbidden } from "@/lib/http/http-error";

/** Engineers and owners edit tracks, bikes, engines and events; others get 403. */
export function assertCanEditSetup(ctx: TeamContext): void {
  if (!roleCan(ctx.role, { setup: ["edit"] })) throw forbidden("Only engineers and the owner change tracks, bikes, engines and events.");
}

export function canEditSetup(ctx: TeamContext): boolean {
  return roleCan(ctx.role, { setup: ["edit"] });
}
