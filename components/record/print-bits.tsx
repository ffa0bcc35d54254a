import type { ReactNode } from "react";
import Link from "next/link";
import { CAUTION_TEXT } from "@/lib/findings/caution";
import { PrintButton } from "./print-button";

export interface PrintHeaderProps {
  team: string;
  bike: string | null;
  rider: string | null;
  date: string | null;
  version: string;
}

/** The header every printed sheet carries: team, bike, rider, date and version. */
export function PrintHeader(p: PrintHeaderProps) {
  return (
    <dl className="print-header" data-testid="print-header">
      <div>
        <dt>Team</dt>
        <dd>{p.team}</dd>
      </div>
      <div>
        <dt>Bike</dt>
        <dd>{p.bike ?? "—"}</dd>
      </div>
      <div>
        <dt>Rider</dt>
        <dd>{p.rider ?? "—"}</dd>
      </div>
      <div>
        <dt>Date</dt>
        <dd>{p.date ?? "—"}</dd>
      </div>
      <div>
        <dt>Version</dt>
        <dd>{p.version}</dd>
      </div>
    </dl>
  );
}

export function PrintCaution({ children }: { children?: ReactNode }) {
  return (
    <aside className="print-caution" role="note" data-testid="print-caution">
      <strong>Caution. </strong>
      {children ?? CAUTION_TEXT}
    </aside>
  );
}

export function PrintSheet({ title, back, children }: { title: string; back: string; children: ReactNode }) {
  return (
    <article className="print-sheet" data-testid="print-sheet">
      <div className="print-toolbar">
        <Link href={back} className="rounded border border-gray-400 px-3 py-1.5 text-sm text-gray-800">
          Back
        </Link>
        <PrintButton />
      </div>
      <h1>{title}</h1>
      {children}
      <p style={{ marginTop: "6mm", fontSize: "8pt", color: "#48515c" }}>Printed from Lapbench. Save as PDF through the browser&apos;s print dialogue (destination: Save as PDF).</p>
    </article>
  );
}
