import type { Metadata } from "next";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { mayReadCapturedMail } from "@/lib/mail/mail-page-access";
import { listCapturedMail } from "@/lib/mail/captured-mail";
import { Logo } from "@/components/ui/logo";

export const metadata: Metadata = { title: "Captured e-mail" };
export const dynamic = "force-dynamic";

/**
 * The local SMTP fake's inbox, so a person trying Lapbench locally can follow invitation and
 * reset links. Only served to this machine, and only while the local mail service is in use
 * (lib/mail/mail-page-access.ts); anyone else gets a 404.
 */
export default async function DevMailPage() {
  if (!mayReadCapturedMail(await headers())) notFound();
  const mails = await listCapturedMail();
  return (
    <main className="mx-auto max-w-4xl px-6 py-10">
      <Logo />
      <h1 className="mt-6 text-2xl font-semibold">Captured e-mail</h1>
      <p className="mb-6 mt-1 text-sm text-ink-300">
        Messages Lapbench sent through the local mail fake (development and demo only; nothing leaves this machine). Newest first.
      </p>
      {mails.length === 0 && <p className="text-ink-400">No e-mail sent yet.</p>}
      <ul className="space-y-4">
        {mails.map((m) => (
          <li key={m.id} className="card" data-testid="mail">
            <div className="flex flex-wrap justify-between gap-2 text-xs text-ink-400">
              <span>To: <span className="text-ink-100" data-testid="mail-to">{m.to.join(", ")}</span></span>
              <span className="num">{new Date(m.receivedAt).toISOString().replace("T", " ").slice(0, 19)} UTC</span>
            </div>
            <h2 className="mt-1 font-semibold">{m.subject}</h2>
            <pre className="mt-2 whitespace-pre-wrap font-sans text-sm text-ink-300">{m.text}</pre>
            {m.links.length > 0 && (
              <div className="mt-3 flex flex-wrap gap-2">
                {m.links.map((l) => (
                  <a key={l} href={l} className="btn-quiet py-1 text-xs" data-testid="mail-link">{l}</a>
                ))}
              </div>
            )}
          </li>
        ))}
      </ul>
    </main>
  );
}
