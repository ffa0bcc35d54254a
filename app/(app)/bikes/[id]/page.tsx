import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { getBike, listBikes } from "@/lib/data/bikes";
import { enginesOfBike } from "@/lib/data/engines";
import { canEditSetup } from "@/lib/data/setup-access";
import { parseId } from "@/lib/http/parse-id";
import { HttpError } from "@/lib/http/http-error";
import { BikeSettingsForm, EngineForm } from "@/components/bikes/bike-forms";
import { EngineLedgerCard } from "@/components/bikes/engine-ledger-card";
import { SetupCaution } from "@/components/setup/setup-caution";

export const metadata: Metadata = { title: "Bike" };

export default async function BikePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ rpm?: string }> }) {
  const { id: raw } = await params;
  const ctx = await pageTeam({}, `/bikes/${raw}`);
  const id = parseId(raw);
  if (!id) notFound();
  const rpmRaw = Number((await searchParams).rpm);
  const rpm = Number.isFinite(rpmRaw) && rpmRaw >= 1000 && rpmRaw <= 25000 ? rpmRaw : undefined;
  const data = await Promise.all([getBike(ctx, id), enginesOfBike(ctx, id, rpm), listBikes(ctx)]).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const [bike, { rpm: chosenRpm, engines }, bikes] = data;
  const editable = canEditSetup(ctx);
  const bikeOptions = bikes.map((b) => ({ id: b.id, name: b.name }));
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <Link href="/bikes" className="hover:underline">Bikes</Link>
        </p>
        <h1 className="text-2xl font-semibold">{bike.name}</h1>
        <p className="text-sm text-ink-400">{bike.className ?? "No class set"}{!editable && " · read-only"}</p>
      </div>
      <SetupCaution />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
        <section className="card" aria-labelledby="settings-h">
          <h2 id="settings-h" className="mb-4 text-sm font-semibold uppercase tracking-wide text-ink-300">Settings</h2>
          <BikeSettingsForm bike={bike} editable={editable} />
        </section>
        <section className="space-y-4" aria-labelledby="ledger-h">
          <div className="card">
            <div className="flex flex-wrap items-end justify-between gap-3">
              <div>
                <h2 id="ledger-h" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Engine ledger</h2>
                <p className="mt-1 text-xs text-ink-400">
                  Life since the last rebuild: the hours and distance when fitted plus every analysed session the engine ran. Warns at 80 % of
                  the rebuild interval (Lapbench&apos;s default, not a manufacturer&apos;s figure).
                </p>
              </div>
              <form method="get" className="flex items-end gap-2" aria-label="Time above rpm">
                <div>
                  <label className="label" htmlFor="rpm">Time above</label>
                  <input id="rpm" name="rpm" className="field num w-28" inputMode="numeric" defaultValue={Math.round(chosenRpm)} />
                </div>
                <span className="pb-2 text-sm text-ink-400">rpm</span>
                <button className="btn-quiet">Show</button>
              </form>
            </div>
          </div>
          {engines.length === 0 && <p className="card text-sm text-ink-400">No engine is fitted to this bike.</p>}
          {engines.map((e) => (
            <EngineLedgerCard key={e.id} engine={e} rpm={chosenRpm} revCeilingRpm={bike.revCeilingRpm} editable={editable} bikes={bikeOptions} />
          ))}
          {editable && (
            <div className="card">
              <h3 className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Add an engine</h3>
              <EngineForm
                engine={{ serial: "", bikeId: bike.id, rebuildIntervalH: null, rebuildIntervalKm: null, hoursAtInstall: 0, kmAtInstall: 0, notes: null }}
                bikes={bikeOptions}
              />
            </div>
          )}
        </section>
      </div>
    </div>
  );
}
