/**
 * The main navigation: which screens exist and which roles see them (the role table in lib/auth/permissions.ts).
 * Only screens that exist are listed; add an entry when a screen ships.
 */
import type { TeamRole } from "./auth/permissions";

export interface NavItem {
  href: string;
  label: string;
  roles: readonly TeamRole[];
}

const ALL: readonly TeamRole[] = ["owner", "engineer", "rider", "viewer"];

export const NAV_ITEMS: readonly NavItem[] = [
  { href: "/home", label: "Team home", roles: ALL },
  { href: "/brief", label: "Rider brief", roles: ALL },
  { href: "/sessions", label: "Sessions", roles: ALL },
  { href: "/compare", label: "Compare", roles: ALL },
  { href: "/upload", label: "Upload", roles: ["owner", "engineer"] },
  { href: "/import-profiles", label: "Import profiles", roles: ["owner", "engineer"] },
  { href: "/events", label: "Events", roles: ALL },
  { href: "/season", label: "Season", roles: ALL },
  { href: "/tracks", label: "Tracks", roles: ALL },
  { href: "/bikes", label: "Bikes", roles: ALL },
  { href: "/engines", label: "Engines", roles: ALL },
  { href: "/activity", label: "Activity", roles: ["owner", "engineer"] },
  { href: "/settings", label: "Settings", roles: ALL },
  { href: "/team", label: "Team", roles: ALL },
];

export function navFor(role: TeamRole): NavItem[] {
  return NAV_ITEMS.filter((i) => i.roles.includes(role));
}

export const ROLE_LABEL: Record<TeamRole, string> = {
  owner: "Owner",
  engineer: "Engineer",
  rider: "Rider",
  viewer: "Viewer (read-only)",
};
