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

/** A route id as a positive integer, or null (→ 404 by the caller). */
export function parseId(raw: string | number | null | undefined): number | null {
  const n = typeof raw === "number" ? raw : Number(raw);
  return Number.isInteger(n) && n > 0 && n < 2 ** 31 ? n : null;
}
