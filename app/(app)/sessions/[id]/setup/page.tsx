import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { getSetupSheetView, type SetupSheetView } from "@/lib/data/setup-sheets";
import { getSessionForViewer } from "@/lib/data/session-for-viewer";
import { SetupCaution } from "@/components/setup/setup-caution";
import { SetupSideBySide, SetupValuesFull } from "@/components/record/setup-values";

export const metadata: Metadata = { title: "Setup history" };

type Search = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);
const when = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

export default async function SetupHistoryPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Search }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/sessions/${id}/setup`);
  const sessionId = parseId(id);
  if (!sessionId) notFound();
  let view: SetupSheetView;
  let title: string;
  try {
    view = await getSetupSheetView(ctx, sessionId);
    title = (await getSessionForViewer(ctx, sessionId)).title;
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
  const sp = await searchParams;
  const byVersion = (n: number) => view.versions.find((v) => v.version === n) ?? null;
  const latest = view.versions[0] ?? null;
  const open = byVersion(Number(one(sp.v))) ?? latest;
  const a = byVersion(Number(one(sp.a)));
  const b = byVersion(Number(one(sp.b)));
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <Link href={`/sessions/${sessionId}`} className="hover:underline">
            {title}
          </Link>
        </p>
        <h1 className="text-2xl font-semibold">Setup history</h1>
        <p className="mt-1 text-sm text-ink-400">
          Every saved version of this session&apos;s setup sheet; nothing is overwritten. Open one in full or compare two.{" "}
          <Link className="text-signal-400 hover:underline" href={`/season/setup-effects?session=${sessionId}`}>
            Effect on lap times
          </Link>{" "}
          ·{" "}
          <Link className="text-signal-400 hover:underline" href={`/print/setup/${sessionId}${open ? `?v=${open.version}` : ""}`}>
            Printable sheet
          </Link>
        </p>
      </div>
      <SetupCaution />
      {view.versions.length === 0 ? (
        <p className="card text-sm text-ink-400">No setup recorded for this session yet.</p>
      ) : (
        <>
          <section className="card" aria-labelledby="versions-h">
            <h2 id="versions-h" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">Versions</h2>
            <ol className="space-y-1 text-sm" data-testid="history-versions">
              {view.versions.map((v) => (
                <li key={v.id} className="flex flex-wrap items-baseline gap-3 rounded border border-ink-800 px-3 py-1.5">
                  <Link href={`/sessions/${sessionId}/setup?v=${v.version}`} className="font-semibold text-signal-400 hover:underline" aria-current={open?.version === v.version ? "true" : undefined}>
                    Version {v.version}
                  </Link>
                  <span className="text-ink-400">
                    {v.authorName ?? "a former member"} · {when(v.createdAt)} · {v.version === 1 ? "first record" : `${v.changed.length} changed`}
                  </span>
                  {v.version > 1 && (
                    <Link href={`/sessions/${sessionId}/setup?a=${v.version - 1}&b=${v.version}`} className="text-xs text-trace-400 hover:underline">
                      compare with version {v.version - 1}
                    </Link>
                  )}
                </li>
              ))}
            </ol>
            {view.versions.length > 1 && (
              <form method="get" className="mt-3 flex flex-wrap items-end gap-3 text-sm" aria-label="Compare versions">
                <label>
                  <span className="label">Compare</span>
                  <select name="a" defaultValue={a?.version ?? view.versions[view.versions.length - 1].version} className="field">
                    {view.versions.map((v) => (
                      <option key={v.id} value={v.version}>
                        Version {v.version}
                      </option>
                    ))}
                  </select>
                </label>
                <label>
                  <span className="label">with</span>
                  <select name="b" defaultValue={b?.version ?? latest!.version} className="field">
                    {view.versions.map((v) => (
                      <option key={v.id} value={v.version}>
                        Version {v.version}
                      </option>
                    ))}
                  </select>
                </label>
                <button className="btn-quiet" type="submit">
                  Compare
                </button>
              </form>
            )}
          </section>
          {a && b ? (
            <section className="card" aria-labelledby="compare-h">
              <h2 id="compare-h" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">
                Version {a.version} beside version {b.version}
              </h2>
              <SetupSideBySide fields={view.fields} left={a.values} right={b.values} leftLabel={`Version ${a.version}`} rightLabel={`Version ${b.version}`} />
            </section>
          ) : (
            open && (
              <section className="card" aria-labelledby="open-h" data-testid="setup-open-version" data-version={open.version}>
                <h2 id="open-h" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">
                  Version {open.version} · {open.authorName ?? "a former member"} · {when(open.createdAt)}
                  {open.version !== latest?.version && <span className="ml-2 text-signal-400">(an earlier version; latest is {latest?.version})</span>}
                </h2>
                <SetupValuesFull fields={view.fields} groups={view.groups} values={open.values} />
              </section>
            )
          )}
        </>
      )}
    </div>
  );
}
