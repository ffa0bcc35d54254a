"use client";
import { useTransition } from "react";
import { useRouter } from "next/navigation";
import { switchTeam } from "@/lib/actions/team";

export function TeamSwitcher({ teams, activeId }: { teams: { teamId: string; teamName: string }[]; activeId: string }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  if (teams.length < 2) return <span className="truncate text-sm font-semibold" data-testid="team-name">{teams[0]?.teamName}</span>;
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only">Team</span>
      <select
        aria-label="Switch team"
        className="field w-auto py-1"
        value={activeId}
        disabled={pending}
        onChange={(e) =>
          start(async () => {
            await switchTeam(e.target.value);
            router.push("/home");
            router.refresh();
          })
        }
      >
        {teams.map((t) => (
          <option key={t.teamId} value={t.teamId}>
            {t.teamName}
          </option>
        ))}
      </select>
    </label>
  );
}
