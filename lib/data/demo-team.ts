import "server-only";
/** Whether this install carries the invented demo team (seeded by `npm start -- --demo` or into an empty database). */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { DEMO_TEAM } from "@/workers/demo-accounts";

export async function demoTeamPresent(): Promise<boolean> {
  const rows = await getSequelize().query<{ id: string }>("SELECT id FROM organization WHERE slug = ? LIMIT 1", {
    replacements: [DEMO_TEAM.slug],
    type: QueryTypes.SELECT,
  });
  return rows.length > 0;
}
