"use client";
import { useState } from "react";
import { tyreSize } from "@/lib/bike/tyre-size";

/** Nominal size from a sidewall marking: a hint for the rolling circumference, not a setting. */
export function TyreCalculator() {
  const [marking, setMarking] = useState("120/70 ZR17");
  const t = tyreSize(marking);
  return (
    <div className="rounded-md border border-ink-700 bg-ink-850 p-3 text-sm" data-testid="tyre-calculator">
      <label className="label" htmlFor="tyre-marking">Tyre size hint</label>
      <div className="flex flex-wrap items-center gap-3">
        <input id="tyre-marking" className="field num w-40" value={marking} onChange={(e) => setMarking(e.target.value)} placeholder="190/55 ZR17" />
        {t ? (
          <p className="text-ink-100" aria-live="polite">
            {marking.trim()} → nominal <span className="num">{Math.round(t.circumferenceMm)}</span> mm around
            <span className="text-ink-400"> (Ø <span className="num">{t.diameterMm.toFixed(1)}</span> mm)</span>
          </p>
        ) : (
          <p className="text-alert-400" aria-live="polite">Write the size as width/aspect rim, e.g. 190/55 ZR17.</p>
        )}
      </div>
      <p className="mt-2 text-xs text-ink-400">
        Ø = 25.4·rim + 2·width·aspect/100, circumference π·Ø. The real rolling circumference is a little smaller (the tyre squats under load):
        measure it, or calibrate against the GPS, before you enter it.
      </p>
    </div>
  );
}
