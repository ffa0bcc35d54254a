/** The owner's download of everything the team owns, as one zip streamed from /api/team/export. */
export function TeamExportCard({ role }: { role: string }) {
  if (role !== "owner") return null;
  return (
    <section className="card space-y-2" aria-labelledby="export-h" data-testid="team-export">
      <h2 id="export-h" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Team data export</h2>
      <p className="text-sm text-ink-300">
        Everything the team owns in one zip: sessions and laps as CSV in SI units with a README of the columns, setup sheets, notes and findings as JSON, and the original uploaded files. It is written while it downloads, so a large team&apos;s export starts at once.
      </p>
      <a className="btn-primary" href="/api/team/export" download>
        Download the team export (.zip)
      </a>
    </section>
  );
}
