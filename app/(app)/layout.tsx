import type { ReactNode } from "react";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { navFor, ROLE_LABEL } from "@/lib/nav";
import { Logo } from "@/components/ui/logo";
import { MainNav } from "@/components/nav/main-nav";
import { TeamSwitcher } from "@/components/nav/team-switcher";
import { SignOutButton } from "@/components/nav/sign-out-button";

export default async function AppLayout({ children }: { children: ReactNode }) {
  const ctx = await pageTeam();
  return (
    <div className="min-h-screen">
      <header className="sticky top-0 z-20 border-b border-ink-800 bg-ink-950/95 backdrop-blur">
        <div className="mx-auto flex max-w-7xl items-center gap-4 px-4 py-2.5">
          <Link href="/home" aria-label="Lapbench home">
            <Logo />
          </Link>
          <span className="h-6 w-px bg-ink-700" aria-hidden />
          <TeamSwitcher teams={ctx.memberships} activeId={ctx.teamId} />
          <div className="ml-auto flex items-center gap-4">
            <span className="hidden text-right text-xs leading-tight sm:block">
              <span className="block font-semibold text-ink-100">{ctx.userName}</span>
              <span className="block text-ink-400" data-testid="role">{ROLE_LABEL[ctx.role]}</span>
            </span>
            <SignOutButton />
          </div>
        </div>
        <div className="mx-auto max-w-7xl px-4 pb-2">
          <MainNav items={navFor(ctx.role)} />
        </div>
      </header>
      <main className="mx-auto max-w-7xl px-4 py-6">{children}</main>
    </div>
  );
}
