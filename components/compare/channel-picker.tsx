"use client";
/** Which channels get a pane. */
import { ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";

/** In the order of the default panes: Inputs, Speed, Chassis, Engine speed, then the rest. */
export const COMPARE_ROLES: ChannelRole[] = [
  "throttle", "brake_front", "brake_rear", "speed_front", "speed_rear", "gps_speed", "fork_travel", "shock_travel",
  "engine_rpm", "gear", "lean_angle", "accel_long", "accel_lat",
];
export const DEFAULT_ROLES: ChannelRole[] = ["throttle", "brake_front", "brake_rear", "speed_front", "speed_rear", "fork_travel", "shock_travel", "engine_rpm", "gear"];

export function ChannelPicker({ selected, onChange }: { selected: string[]; onChange: (roles: string[]) => void }) {
  return (
    <fieldset>
      <legend className="label">Channels</legend>
      <div className="grid grid-cols-1 gap-0.5">
        {COMPARE_ROLES.map((r) => {
          const on = selected.includes(r);
          return (
            <label key={r} className="flex cursor-pointer items-center gap-2 rounded px-1.5 py-0.5 text-sm hover:bg-ink-850">
              <input
                type="checkbox"
                className="size-4 accent-signal-500"
                checked={on}
                // Keep the request's order the picker's order, so panes do not jump around.
                onChange={() => onChange(on ? selected.filter((s) => s !== r) : COMPARE_ROLES.filter((x) => x === r || selected.includes(x)))}
              />
              {ROLE_LABEL[r]}
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}
