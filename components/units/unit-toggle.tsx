"use client";
/** Metric / imperial switch; server-rendered tables re-render with the new cookie. */
import { useRouter } from "next/navigation";
import { setUnitSystem, useUnitSystem } from "@/lib/client/use-unit-system";
import type { UnitSystem } from "@/lib/units/unit-system";

export function UnitToggle({ initial }: { initial: UnitSystem }) {
  const system = useUnitSystem(initial);
  const router = useRouter();
  const choose = (s: UnitSystem) => {
    setUnitSystem(s);
    router.refresh();
  };
  return (
    <div role="group" aria-label="Units" className="inline-flex overflow-hidden rounded-md border border-ink-600 text-xs">
      {(["metric", "imperial"] as const).map((s) => (
        <button
          key={s}
          type="button"
          aria-pressed={system === s}
          onClick={() => choose(s)}
          className={`px-2.5 py-1 font-semibold capitalize ${system === s ? "bg-ink-700 text-signal-400" : "text-ink-300 hover:bg-ink-800"}`}
        >
          {s}
        </button>
      ))}
    </div>
  );
}
