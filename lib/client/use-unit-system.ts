"use client";
/** The person's metric/imperial choice, from the `lapbench-units` cookie (lib/units/unit-system.ts). */
import { useSyncExternalStore } from "react";
import { UNIT_COOKIE, parseUnitSystem, type UnitSystem } from "@/lib/units/unit-system";

const listeners = new Set<() => void>();

function read(): UnitSystem {
  const m = new RegExp(`(?:^|; )${UNIT_COOKIE}=([^;]*)`).exec(document.cookie);
  return parseUnitSystem(m?.[1]);
}

export function setUnitSystem(system: UnitSystem): void {
  // A year, whole site; not secret, so readable by scripts.
  document.cookie = `${UNIT_COOKIE}=${system}; path=/; max-age=31536000; samesite=lax`;
  for (const l of listeners) l();
}

export function useUnitSystem(serverValue: UnitSystem = "metric"): UnitSystem {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    read,
    () => serverValue,
  );
}
