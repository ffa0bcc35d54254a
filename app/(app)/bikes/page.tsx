import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { listBikes } from "@/lib/data/bikes";
import { canEditSetup } from "@/lib/data/setup-access";
import { CreateBikeForm } from "@/components/bikes/bike-forms";

export const metadata: Metadata = { title: "Bikes" };

export default async function BikesPage() {
  const ctx = await pageTeam({}, "/bikes");
  const editable = canEditSetup(ctx);
  const bikes = await listBikes(ctx);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Bikes and engines</h1>
        {!editable && <p className="mt-1 text-sm text-ink-400">Read-only: engineers and the owner change bikes and engines.</p>}
      </div>
      <section className="card" aria-labelledby="bikes-h">
        <h2 id="bikes-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Bikes</h2>
        {bikes.length === 0 ? (
          <p className="text-sm text-ink-400">No bikes yet.{editable ? " Add the first one below." : ""}</p>
        ) : (
          <table className="table-plain" data-testid="bikes-table">
            <thead>
              <tr>
                <th>Bike</th>
                <th>Class</th>
                <th className="text-right">Rev ceiling</th>
                <th>Engines</th>
              </tr>
            </thead>
            <tbody>
              {bikes.map((b) => (
                <tr key={b.id}>
                  <td className="font-medium"><Link className="text-signal-400 hover:underline" href={`/bikes/${b.id}`}>{b.name}</Link></td>
                  <td className="text-ink-300">{b.className ?? "—"}</td>
                  <td className="num text-right">{b.revCeilingRpm ? `${b.revCeilingRpm.toLocaleString("en-GB")} rpm` : "—"}</td>
                  <td className="num text-ink-300">{b.engineSerials.join(", ") || "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      {editable && (
        <section className="card" aria-labelledby="add-bike-h">
          <h2 id="add-bike-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Add a bike</h2>
          <CreateBikeForm />
        </section>
      )}
    </div>
  );
}
