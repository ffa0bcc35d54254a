"use client";
/**
 * The drop zone: each file goes through the uploadthing SDK to /api/uploadthing (which checks the
 * role and the extension, and turns the stored file into a Session), one after another, with its
 * own progress bar. One file → on to its session (mapping screen if its columns need mapping);
 * several → a link per session.
 */
import { useCallback, useRef, useState, useSyncExternalStore } from "react";
import { useRouter } from "next/navigation";
import Link from "next/link";
import { useDropzone } from "@uploadthing/react";
import { useUploadThing } from "@/lib/client/uploadthing";

type ItemState = "waiting" | "uploading" | "reading" | "done" | "error";

interface Item {
  key: string;
  name: string;
  size: number;
  progress: number;
  state: ItemState;
  message?: string;
  href?: string;
  /** A failure a second try may fix (not a refusal of role, type or size). */
  canRetry?: boolean;
}

function formatSize(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${(bytes / (1024 * 1024)).toFixed(1).replace(/\.0$/, "")} MB`;
  if (bytes >= 1024) return `${(bytes / 1024).toFixed(0)} kB`;
  return `${bytes} bytes`;
}

/** Make the SDK's refusals read as plain sentences about this file. */
function explain(e: { code?: string; message?: string }, file: File, maxBytes: number): string {
  const msg = e.message ?? "";
  if (/FileSizeMismatch|too large|TOO_LARGE/i.test(msg) || e.code === "TOO_LARGE")
    return `"${file.name}" is ${formatSize(file.size)}; files up to ${formatSize(maxBytes)} are accepted. Split the export or leave out channels you do not need.`;
  if (e.code === "FORBIDDEN") return msg || "Your role in this team does not allow uploads.";
  if (/Failed to fetch|NetworkError|network/i.test(msg)) return `"${file.name}" could not be sent: the connection failed. Nothing was stored; try again.`;
  return msg || `"${file.name}" could not be uploaded. Nothing was stored; try again.`;
}

async function sessionTarget(sessionId: number): Promise<string> {
  try {
    const res = await fetch(`/api/sessions/${sessionId}`, { cache: "no-store" });
    const body = (await res.json()) as { session?: { status: string } };
    if (body.session?.status === "mapping") return `/sessions/${sessionId}/import`;
  } catch {
    // The session page shows the status either way.
  }
  return `/sessions/${sessionId}`;
}

const noSubscription = () => () => {};

export function LogDropzone({ maxBytes, extensions }: { maxBytes: number; extensions: readonly string[] }) {
  const router = useRouter();
  const [items, setItems] = useState<Item[]>([]);
  const [busy, setBusy] = useState(false);
  // Files dropped before hydration would be lost: say when the zone listens (tests wait for it too).
  const ready = useSyncExternalStore(noSubscription, () => true, () => false);
  const current = useRef<string | null>(null);
  const lastError = useRef<{ code?: string; message?: string } | null>(null);

  const patch = useCallback((key: string, p: Partial<Item>) => setItems((list) => list.map((i) => (i.key === key ? { ...i, ...p } : i))), []);

  const { startUpload } = useUploadThing("logFile", {
    uploadProgressGranularity: "fine",
    onUploadProgress: (p) => {
      const key = current.current;
      // At 100% the bytes are stored; the server still reads the header before it answers.
      if (key) patch(key, p >= 100 ? { progress: 100, state: "reading" } : { progress: p, state: "uploading" });
    },
    onUploadError: (e) => {
      lastError.current = { code: e.code, message: e.message };
    },
  });

  /** Files whose upload failed in a way a second try may fix, by item key. */
  const retryable = useRef(new Map<string, File>());

  /** One file through the SDK; its session's page, or null with the item marked as failed. */
  const uploadOne = useCallback(
    async (file: File, key: string): Promise<string | null> => {
      current.current = key;
      lastError.current = null;
      retryable.current.delete(key);
      patch(key, { state: "uploading", progress: 0, message: undefined, canRetry: false });
      const res = await startUpload([file]).catch((e: unknown) => {
        lastError.current ??= { message: e instanceof Error ? e.message : String(e) };
        return undefined;
      });
      const sessionId = (res?.[0]?.serverData as { sessionId?: number } | undefined)?.sessionId;
      if (!sessionId) {
        const err: { code?: string; message?: string } = lastError.current ?? {};
        // A refusal (role, type, size) stays refused; anything else may pass on a second try.
        const canRetry = err.code !== "FORBIDDEN" && err.code !== "BAD_REQUEST" && err.code !== "TOO_LARGE";
        if (canRetry) retryable.current.set(key, file);
        patch(key, { state: "error", message: explain(err, file, maxBytes), canRetry });
        return null;
      }
      const href = await sessionTarget(sessionId);
      patch(key, { state: "done", progress: 100, href });
      return href;
    },
    [maxBytes, patch, startUpload],
  );

  const uploadAll = useCallback(
    async (files: File[]) => {
      if (files.length === 0) return;
      const fresh: Item[] = files.map((f, n) => ({ key: `${Date.now()}-${n}-${f.name}`, name: f.name, size: f.size, progress: 0, state: "waiting" }));
      setItems((list) => [...fresh, ...list]);
      setBusy(true);
      const done: string[] = [];
      for (let n = 0; n < files.length; n++) {
        const file = files[n]!;
        const key = fresh[n]!.key;
        if (file.size > maxBytes) {
          patch(key, { state: "error", message: explain({ code: "TOO_LARGE" }, file, maxBytes) });
          continue;
        }
        if (file.size === 0) {
          patch(key, { state: "error", message: `"${file.name}" is empty (0 bytes); export the log again.` });
          continue;
        }
        const href = await uploadOne(file, key);
        if (href) done.push(href);
      }
      current.current = null;
      setBusy(false);
      if (files.length === 1 && done.length === 1) router.push(done[0]!);
    },
    [maxBytes, patch, router, uploadOne],
  );

  /** The same file again, after a failure that may pass (service down, connection lost). */
  const retry = useCallback(
    async (key: string) => {
      const file = retryable.current.get(key);
      if (!file) return;
      setBusy(true);
      const href = await uploadOne(file, key);
      current.current = null;
      setBusy(false);
      if (href) router.push(href);
    },
    [router, uploadOne],
  );

  const { getRootProps, getInputProps, isDragActive } = useDropzone({ onDrop: (files: File[]) => void uploadAll(files), multiple: true, disabled: busy });

  return (
    <div className="space-y-4">
      <div
        {...getRootProps()}
        role="button"
        aria-label="Drop logger exports here, or choose files"
        aria-disabled={busy}
        data-testid="dropzone"
        data-ready={ready ? "true" : "false"}
        className={`flex cursor-pointer flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-6 py-12 text-center transition-colors focus:outline-none focus-visible:ring-2 focus-visible:ring-signal-500 ${
          isDragActive ? "border-signal-500 bg-signal-500/5" : "border-ink-600 bg-ink-950 hover:border-ink-400"
        } ${busy ? "cursor-wait opacity-70" : ""}`}
      >
        <input {...getInputProps()} data-testid="dropzone-input" />
        <svg aria-hidden viewBox="0 0 24 24" className="h-8 w-8 text-trace-400" fill="none" stroke="currentColor" strokeWidth="1.6">
          <path d="M12 16V4m0 0-4 4m4-4 4 4M4 16v3a1 1 0 0 0 1 1h14a1 1 0 0 0 1-1v-3" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
        <p className="font-semibold">{isDragActive ? "Release to upload" : "Drop logger exports here"}</p>
        <p className="text-sm text-ink-400">
          or <span className="font-semibold text-signal-400 underline underline-offset-2">choose files</span> · {extensions.join(" ")} · up to {formatSize(maxBytes)} each
        </p>
      </div>

      {items.length > 0 && (
        <ul className="space-y-3" aria-label="Uploads" data-testid="upload-list">
          {items.map((i) => (
            <li key={i.key} className="rounded-md border border-ink-700 bg-ink-950 p-3" data-testid="upload-item" data-state={i.state}>
              <div className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
                <span className="font-medium break-all">{i.name}</span>
                <span className="num text-xs text-ink-400">{formatSize(i.size)}</span>
              </div>
              {i.state !== "error" && (
                <div className="mt-2 flex items-center gap-3">
                  <div
                    role="progressbar"
                    aria-label={`Upload of ${i.name}`}
                    aria-valuemin={0}
                    aria-valuemax={100}
                    aria-valuenow={Math.round(i.progress)}
                    className="h-2 flex-1 overflow-hidden rounded-full bg-ink-800"
                  >
                    <div className={`h-full rounded-full transition-[width] duration-200 ${i.state === "done" ? "bg-ok-400" : "bg-trace-400"}`} style={{ width: `${i.progress}%` }} />
                  </div>
                  <span className="num w-12 text-right text-xs text-ink-300">{Math.round(i.progress)}%</span>
                </div>
              )}
              <p className="mt-1.5 text-xs" role={i.state === "error" ? "alert" : undefined}>
                {i.state === "waiting" && <span className="text-ink-400">Waiting…</span>}
                {i.state === "uploading" && <span className="text-ink-300">Uploading…</span>}
                {i.state === "reading" && <span className="text-signal-400">Stored. Reading the header…</span>}
                {i.state === "done" && i.href && (
                  <Link href={i.href} className="text-ok-400 underline underline-offset-2">
                    {i.href.endsWith("/import") ? "Uploaded — map its columns" : "Uploaded — open the session"}
                  </Link>
                )}
                {i.state === "error" && <span className="text-alert-400">{i.message}</span>}
              </p>
              {i.state === "error" && i.canRetry && (
                <button
                  type="button"
                  onClick={() => void retry(i.key)}
                  disabled={busy}
                  className="mt-2 rounded border border-ink-500 px-2 py-0.5 text-xs font-semibold text-ink-100 hover:border-signal-400 disabled:opacity-50"
                >
                  Try again
                </button>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
