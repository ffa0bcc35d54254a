/** The invented demo team's sign-ins, printed by `npm start` and used by the seed and the e2e tests. */
export const DEMO_PASSWORD = "lapbench-demo-2026";
export const DEMO_TEAM = { name: "Larkspur Vale Racing", slug: "larkspur-vale" } as const;
export const DEMO_USERS = [
  { role: "owner", email: "owner@larkspur.example", name: "Maren Oakes" },
  { role: "engineer", email: "engineer@larkspur.example", name: "Tobias Wrenfield" },
  { role: "rider", email: "rider@larkspur.example", name: "Ilka Stroud" },
  { role: "viewer", email: "crew@larkspur.example", name: "Pim Aldous" },
] as const;
export type TeamRole = (typeof DEMO_USERS)[number]["role"];
