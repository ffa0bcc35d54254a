import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { getSessionOverview } from "@/lib/data/session-overview";
import { getSetupSheetView } from "@/lib/data/setup-sheets";
import { PrintCaution, PrintHeader, PrintSheet } from "@/components/record/print-bits";
import { showSetupValue } from "@/components/record/setup-values";

export const metadata: Metadata = { title: "Setup sheet (print)" };

export default async function PrintSetupPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ v?: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/print/setup/${id}`);
  const sessionId = parseId(id);
  if (!sessionId) notFound();
  const [o, view] = await Promise.all([getSessionOverview(ctx, sessionId), getSetupSheetView(ctx, sessionId)]).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const want = Number((await searchParams).v);
  const v = view.versions.find((x) => x.version === want) ?? view.versions[0] ?? null;
  const changed = new Set(v?.changed ?? []);
  return (
    <PrintSheet title={`Setup sheet · ${o.session.title}`} back={`/sessions/${sessionId}/setup`}>
      <PrintHeader team={ctx.teamName} bike={o.bikeName} rider={o.riderName} date={(o.session.startedAt ?? o.session.createdAt).slice(0, 10)} version={v ? `Setup v${v.version} (${v.createdAt.slice(0, 10)}, ${v.authorName ?? "former member"})` : "no setup recorded"} />
      <p>
        {o.eventName ?? "No event"} · {o.trackName ?? "no track"} · engine {o.engineSerial ?? "—"} · {o.session.conditions ?? "conditions not recorded"}
      </p>
      <PrintCaution>A setup sheet records what was fitted; it is not advice on what to fit. Setup work follows the manufacturer&apos;s service data, the championship&apos;s technical rules and qualified mechanics. Check every setting on the bike before it goes out.</PrintCaution>
      {!v ? (
        <p>No setup recorded for this session.</p>
      ) : (
        view.groups.map((g) => (
          <section key={g.id} className="print-group">
            <h2>{g.label}</h2>
            <table>
              <tbody>
                {view.fields
                  .filter((f) => f.group === g.id)
                  .map((f) => (
                    <tr key={f.name} className={changed.has(f.name) ? "print-changed" : undefined}>
                      <td style={{ width: "45%" }}>{f.label}</td>
                      <td className={f.kind === "longtext" ? "" : "num"} style={{ whiteSpace: "pre-wrap" }}>
                        {showSetupValue(f, v.values[f.name] ?? null)}
                        {changed.has(f.name) && ` (was ${showSetupValue(f, v.previous[f.name] ?? null)})`}
                      </td>
                    </tr>
                  ))}
              </tbody>
            </table>
          </section>
        ))
      )}
    </PrintSheet>
  );
}
