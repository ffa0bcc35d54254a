import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { getImportScreen, sessionFormOptions, type ImportScreen } from "@/lib/data/session-edit";
import { ImportForm } from "@/components/session/import-form";

export const metadata: Metadata = { title: "Import" };

const FORMAT_NAME = { csv: "CSV", gpx: "GPX 1.1", nmea: "NMEA 0183" } as const;

export default async function ImportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({ permission: { "session-data": ["upload"] } }, `/sessions/${id}/import`);
  const sessionId = parseId(id);
  if (!sessionId) notFound();
  let screen: ImportScreen;
  try {
    screen = await getImportScreen(ctx, sessionId);
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
  // Only a CSV waiting for its mapping is mapped here; anything else shows its status on the session page.
  if (screen.status !== "mapping") redirect(`/sessions/${sessionId}`);
  const options = await sessionFormOptions(ctx.teamId);
  const meta = Object.entries(screen.metadata);

  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <Link href={`/sessions/${sessionId}`} className="hover:underline">Session {sessionId}</Link> · Import
        </p>
        <h1 className="text-2xl font-semibold">Session details and column mapping</h1>
      </div>

      <section className="card" aria-labelledby="file">
        <h2 id="file" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">File</h2>
        <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-5" data-testid="file-facts">
          <div className="col-span-2">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-400">Name</dt>
            <dd className="font-mono break-all">{screen.fileName}</dd>
          </div>
          <div>
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-400">Format</dt>
            <dd>{screen.format ? FORMAT_NAME[screen.format] : "—"}</dd>
          </div>
          <div>
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-400">Size</dt>
            <dd className="num">{screen.fileBytes != null ? fileSize(screen.fileBytes) : "—"}</dd>
          </div>
          <div>
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-400">Layout</dt>
            <dd>
              {screen.delimiter ?? "—"}-separated{screen.decimalComma ? ", decimal comma" : ""}
              {screen.headerLine ? `, header on line ${screen.headerLine}` : ""}, {screen.columns.length} columns
            </dd>
          </div>
        </dl>
        {meta.length > 0 && (
          <>
            <h3 className="mb-2 mt-4 text-xs font-semibold uppercase tracking-wide text-ink-400">Header metadata</h3>
            <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2 lg:grid-cols-3" data-testid="file-metadata">
              {meta.map(([k, v]) => (
                <div key={k} className="flex gap-2">
                  <dt className="text-ink-400">{k}:</dt>
                  <dd className="break-all">{v}</dd>
                </div>
              ))}
            </dl>
          </>
        )}
      </section>

      <ImportForm
        sessionId={sessionId}
        columns={screen.columns}
        timeFormat={screen.timeFormat}
        profileName={screen.profileName}
        existingProfile={screen.existingProfile}
        mappedBefore={screen.mappedBefore}
        details={screen.details}
        options={options}
      />
    </div>
  );
}

/** Bytes for people: exact below 1 kB, then kB and MB with one decimal. */
function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  const kb = bytes / 1024;
  return kb < 1024 ? `${kb.toLocaleString("en-GB", { maximumFractionDigits: 1 })} kB` : `${(kb / 1024).toLocaleString("en-GB", { maximumFractionDigits: 1 })} MB`;
}
