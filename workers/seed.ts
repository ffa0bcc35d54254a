/**
 * Seeds the invented demo team (idempotent): four sign-ins, one per role, riders, bikes, engines
 * and an event. Every name here is invented. Run by `npm start`; safe to run again.
 */
import { QueryTypes } from "sequelize";
import { getSequelize } from "../models/db";
import { initModels, Rider, Bike, Engine, RaceEvent } from "../models";
import { createAuth } from "../lib/auth/create-auth";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS } from "./demo-accounts";

export async function seedDemo(): Promise<{ teamId: string; userIds: Record<string, string> }> {
  const sequelize = getSequelize();
  initModels(sequelize);
  const auth = createAuth(sequelize);

  const userIds: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const found = await sequelize.query<{ id: string }>("SELECT id FROM user WHERE email = ?", { replacements: [u.email], type: QueryTypes.SELECT });
    if (found[0]) userIds[u.role] = found[0].id;
    else {
      const r = await auth.api.signUpEmail({ body: { email: u.email, password: DEMO_PASSWORD, name: u.name } });
      userIds[u.role] = r.user.id;
    }
  }

  let teamId: string;
  const teams = await sequelize.query<{ id: string }>("SELECT id FROM organization WHERE slug = ?", { replacements: [DEMO_TEAM.slug], type: QueryTypes.SELECT });
  if (teams[0]) teamId = teams[0].id;
  else {
    const t = await auth.api.createOrganization({ body: { name: DEMO_TEAM.name, slug: DEMO_TEAM.slug, userId: userIds.owner } });
    if (!t) throw new Error("could not create the demo team");
    teamId = t.id;
  }

  for (const u of DEMO_USERS) {
    if (u.role === "owner") continue;
    const m = await sequelize.query<{ id: string }>("SELECT id FROM member WHERE organizationId = ? AND userId = ?", {
      replacements: [teamId, userIds[u.role]],
      type: QueryTypes.SELECT,
    });
    if (!m[0]) await auth.api.addMember({ body: { userId: userIds[u.role], role: u.role, organizationId: teamId } });
  }

  if ((await Bike.count({ where: { teamId } })) === 0) {
    const riderUser = DEMO_USERS.find((u) => u.role === "rider")!;
    await Rider.bulkCreate([
      { teamId, name: riderUser.name, raceNumber: "27", userId: userIds.rider },
      { teamId, name: "Jory Penhallow", raceNumber: "64", userId: null },
    ]);
    // Invented machines. Rolling circumferences a little under the nominal π·D of a 120/70 ZR17
    // front (1884 mm) and a 190/55 ZR17 rear (2013 mm), as real tyres roll smaller (REFERENCES.md).
    const common = {
      className: "Superbike (1000 cc four)",
      wheelCircFrontMm: 1850,
      wheelCircRearMm: 1960,
      primaryRatio: 1.667,
      gearboxRatios: [2.6, 2.05, 1.71, 1.5, 1.36, 1.25],
      sprocketFront: 16,
      sprocketRear: 41,
      revCeilingRpm: 14200,
      forkStrokeMm: 120,
      shockStrokeMm: 65,
      tyreCrownRadiusMm: 95,
      calibrations: null,
      thresholds: null,
    };
    const [b1, b2] = await Bike.bulkCreate([
      { teamId, name: "Bike 27", ...common },
      { teamId, name: "Bike 64", ...common },
    ]);
    await Engine.bulkCreate([
      { teamId, bikeId: b1.id, serial: "LV-E101", rebuildIntervalH: 30, rebuildIntervalKm: 5000, notes: "Fresh build for the season opener" },
      { teamId, bikeId: b2.id, serial: "LV-E102", rebuildIntervalH: 30, rebuildIntervalKm: 5000, notes: null },
    ]);
    await RaceEvent.create({ teamId, trackId: null, name: "Spring test days", startsOn: "2026-04-11", endsOn: "2026-04-12" });
  }
  return { teamId, userIds };
}

if (process.argv[1] && /seed\.ts$/.test(process.argv[1])) {
  seedDemo()
    .then(async ({ teamId }) => {
      console.log(`[seed] demo team ready (${teamId})`);
      await getSequelize().close();
    })
    .catch((e) => {
      console.error("[seed] failed:", e);
      process.exit(1);
    });
}
