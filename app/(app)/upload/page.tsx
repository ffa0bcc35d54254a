import type { Metadata } from "next";
import { pageTeam } from "@/lib/auth/page-guard";
import { LIMITS, LIMIT_STATEMENTS } from "@/lib/ingest/limits";
import { LOG_FILE_EXTENSIONS, LOG_FILE_MAX_SIZE } from "@/lib/uploads/file-router";
import { LogDropzone } from "@/components/upload/log-dropzone";

export const metadata: Metadata = { title: "Upload" };

const FORMATS = [
  { name: "CSV channel export", detail: "One header row, units in [..] or (..) after the name; comma, semicolon or tab; time in seconds, milliseconds or ISO 8601. Optional '# key: value' lines first." },
  { name: "GPX 1.1", detail: "Track points with time, from a GPS logger or phone." },
  { name: "NMEA 0183", detail: "RMC and GGA sentences, as GPS loggers write them." },
];

export default async function UploadPage() {
  const ctx = await pageTeam({ permission: { "session-data": ["upload"] } }, "/upload");
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Upload</h1>
        <p className="mt-1 text-sm text-ink-400">Each file becomes a Session. A CSV whose columns the team has mapped before is read at once; a new layout asks for its column mapping first.</p>
      </div>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section className="card" aria-label="Drop zone">
          <LogDropzone maxBytes={LIMITS.maxBytes} extensions={LOG_FILE_EXTENSIONS} />
        </section>
        <aside className="space-y-6">
          <section className="card" aria-labelledby="formats">
            <h2 id="formats" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Accepted formats</h2>
            <ul className="space-y-2 text-sm" data-testid="formats">
              {FORMATS.map((f) => (
                <li key={f.name}>
                  <span className="font-semibold">{f.name}</span>
                  <span className="block text-ink-400">{f.detail}</span>
                </li>
              ))}
            </ul>
            <p className="mt-3 text-xs text-ink-400">File names ending in {LOG_FILE_EXTENSIONS.join(", ")}.</p>
          </section>
          <section className="card" aria-labelledby="limits">
            <h2 id="limits" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Limits</h2>
            <ul className="list-disc space-y-1 pl-5 text-sm text-ink-300" data-testid="limits">
              <li>One upload may be at most {LOG_FILE_MAX_SIZE.replace("MB", " MB")}.</li>
              {Object.values(LIMIT_STATEMENTS).map((s) => (
                <li key={s}>{s}</li>
              ))}
            </ul>
          </section>
        </aside>
      </div>
    </div>
  );
}
