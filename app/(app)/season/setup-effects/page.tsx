import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { parseId } from "@/lib/http/parse-id";
import { EFFECT_CAUTION, getSetupEffects } from "@/lib/data/setup-history";
import { SETUP_FIELDS } from "@/lib/data/setup-sheets";
import { EffectList } from "@/components/record/effect-list";

export const metadata: Metadata = { title: "Setup effects" };

type Search = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function SetupEffectsPage({ searchParams }: { searchParams: Search }) {
  const ctx = await pageTeam({}, "/season/setup-effects");
  const sp = await searchParams;
  const view = await getSetupEffects(ctx, { bikeId: parseId(one(sp.bike)), trackId: parseId(one(sp.track)), sessionId: parseId(one(sp.session)) });
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <Link href="/season" className="hover:underline">
            Season record
          </Link>
        </p>
        <h1 className="text-2xl font-semibold">Setup effects</h1>
        <p className="mt-1 text-sm text-ink-400">
          Each setup change between consecutive sessions of the same bike at the same track, with the best lap, the best-three mean, the conditions and the sectors that moved most.
        </p>
      </div>
      <p role="note" data-testid="effect-caution" className="rounded-md border border-signal-600/50 bg-signal-500/10 px-4 py-3 text-sm text-signal-400">
        {EFFECT_CAUTION}
      </p>
      <EffectList view={view} fields={SETUP_FIELDS} />
    </div>
  );
}
