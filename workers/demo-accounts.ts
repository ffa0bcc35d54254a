/** The invented demo team's sign-ins, printed by `npm start` and used by the seed and the e2e tests. */
import { DEMO_ROSTER } from "../sample-logs/demo-roster";

export const DEMO_PASSWORD = "lapbench-demo-2026";
export const DEMO_TEAM = DEMO_ROSTER.team;
export const DEMO_USERS = [
  { role: "owner", email: "owner@larkspur.example", name: "Maren Oakes" },
  { role: "engineer", email: "engineer@larkspur.example", name: "Tobias Wrenfield" },
  { role: "rider", email: "rider@larkspur.example", name: DEMO_ROSTER.riders.a.name },
  { role: "viewer", email: "crew@larkspur.example", name: "Pim Aldous" },
] as const;
export type TeamRole = (typeof DEMO_USERS)[number]["role"];
