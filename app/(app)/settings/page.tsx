import type { Metadata } from "next";
import { getMailPreferences } from "@/lib/data/mail-preferences";
import { pageTeam } from "@/lib/auth/page-guard";
import { roleCan } from "@/lib/auth/guard";
import { getThresholdSettings, type ThresholdOwner } from "@/lib/data/thresholds";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { BIKE_THRESHOLD_FIELDS, TRACK_THRESHOLD_FIELDS, round, shownDefault, type ThresholdField } from "@/lib/findings/threshold-settings";
import { CautionNote } from "@/components/analysis/caution-note";
import { ThresholdForm, type FormField } from "@/components/settings/threshold-form";
import { MailPreferencesSection } from "@/components/record/mail-preferences-section";

export const metadata: Metadata = { title: "Settings" };

function formFields(fields: readonly ThresholdField[], owner: ThresholdOwner): FormField[] {
  return fields.map((f) => {
    const d = DEFAULT_THRESHOLDS[f.key];
    const v = owner.overrides[f.key];
    return { key: f.key, label: f.label, unit: f.unit, min: f.min, max: f.max, defaultShown: shownDefault(f), source: d.source, rationale: d.rationale, current: v === undefined ? null : round(v * f.factor) };
  });
}

export default async function SettingsPage() {
  const ctx = await pageTeam({}, "/settings");
  const canEdit = roleCan(ctx.role, { setup: ["edit"] });
  const s = await getThresholdSettings(ctx);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Settings</h1>
      </div>
      <MailPreferencesSection prefs={await getMailPreferences(ctx)} role={ctx.role} />
      <section className="space-y-3" aria-labelledby="th">
        <h2 id="th" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Findings thresholds</h2>
        <p className="max-w-3xl text-sm text-ink-300">
          What counts as a Finding, per bike and per track. Each default says where it comes from: <span className="text-trace-400">common practice</span> (a figure of the trade with no
          published source) or <span className="text-ink-100">Lapbench default</span> (our own starting setting). {canEdit ? "" : "Only engineers and owners can change them."}
        </p>
        <CautionNote />
      </section>
      <section className="space-y-4" aria-labelledby="bikes">
        <h2 id="bikes" className="text-lg font-semibold">Bikes</h2>
        {s.bikes.length === 0 ? <p className="text-sm text-ink-400">No bikes yet.</p> : null}
        {s.bikes.map((b) => (
          <ThresholdForm key={b.id} scope="bike" id={b.id} name={b.name} fields={formFields(BIKE_THRESHOLD_FIELDS, b)} canEdit={canEdit} note="A rev ceiling entered on the bike itself takes precedence." />
        ))}
      </section>
      <section className="space-y-4" aria-labelledby="tracks">
        <h2 id="tracks" className="text-lg font-semibold">Tracks</h2>
        {s.tracks.length === 0 ? <p className="text-sm text-ink-400">No tracks yet.</p> : null}
        {s.tracks.map((t) => (
          <ThresholdForm key={t.id} scope="track" id={t.id} name={t.name} fields={formFields(TRACK_THRESHOLD_FIELDS, t)} canEdit={canEdit} note="A pit-lane limit entered on the track itself takes precedence." />
        ))}
      </section>
    </div>
  );
}
