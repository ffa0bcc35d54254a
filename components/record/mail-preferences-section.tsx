import type { TeamContext } from "@/lib/auth/guard";
import { getMailPreferences } from "@/lib/data/mail-preferences";
import { MailPreferencesForm } from "./mail-preferences-form";

export async function MailPreferencesSection({ ctx }: { ctx: TeamContext }) {
  const prefs = await getMailPreferences(ctx);
  return (
    <section className="space-y-3" aria-labelledby="mail-h">
      <h2 id="mail-h" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Your e-mail</h2>
      <MailPreferencesForm prefs={prefs} role={ctx.role} />
    </section>
  );
}
