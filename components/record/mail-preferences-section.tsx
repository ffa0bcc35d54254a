import type { TeamRole } from "@/lib/auth/permissions";
import type { getMailPreferences } from "@/lib/data/mail-preferences";
import { MailPreferencesForm } from "./mail-preferences-form";

export function MailPreferencesSection({ prefs, role }: { prefs: Awaited<ReturnType<typeof getMailPreferences>>; role: TeamRole }) {
  return (
    <section className="space-y-3" aria-labelledby="mail-h">
      <h2 id="mail-h" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Your e-mail</h2>
      <MailPreferencesForm prefs={prefs} role={role} />
    </section>
  );
}
