/**
 * Who may do what inside a team, as better-auth access-control roles. Browser-safe:
 * shared by the server options (lib/auth/options.ts) and the React client (lib/auth/client.ts).
 *
 * The organization plugin checks its own resources (organization, member, invitation, ac) when a
 * team is updated/deleted or people are invited/added, so those statements stay in the list; ours
 * sit beside them. "team" replaces the plugin's sub-team resource (that feature is off).
 */
import { createAccessControl } from "better-auth/plugins/access";
import { defaultStatements, ownerAc } from "better-auth/plugins/organization/access";

export const statements = {
  ...defaultStatements,
  team: ["update", "delete"],
  member: ["create", "update", "delete"],
  invitation: ["create", "cancel"],
  "session-data": ["upload", "delete"],
  // Tracks, bikes, engines, setup sheets and thresholds.
  setup: ["edit"],
  finding: ["acknowledge"],
  note: ["create"],
} as const;

export const ac = createAccessControl(statements);

export const owner = ac.newRole({
  ...ownerAc.statements,
  team: ["update", "delete"],
  member: ["create", "update", "delete"],
  invitation: ["create", "cancel"],
  "session-data": ["upload", "delete"],
  setup: ["edit"],
  finding: ["acknowledge"],
  note: ["create"],
});

// Works the data, but no team/member/role changes and no deleting.
export const engineer = ac.newRole({
  "session-data": ["upload"],
  setup: ["edit"],
  finding: ["acknowledge"],
  note: ["create"],
});

// Notes only; "on their own sessions" is checked by the route against the session's rider.
export const rider = ac.newRole({
  note: ["create"],
});

// Read-only.
export const viewer = ac.newRole({});

export const roles = { owner, engineer, rider, viewer };
export type TeamRole = keyof typeof roles;
export const teamRoles = Object.keys(roles) as TeamRole[];
