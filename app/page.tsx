import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { auth } from "@/lib/auth/auth";
import { pageTeam } from "@/lib/auth/page-guard";

/** The landing page after sign-in: riders start on their Rider brief, everyone else on Team home. */
export default async function Index() {
  const session = await auth.api.getSession({ headers: await headers() });
  if (!session) redirect("/sign-in");
  const ctx = await pageTeam({}, "/");
  redirect(ctx.role === "rider" ? "/brief" : "/home");
}
