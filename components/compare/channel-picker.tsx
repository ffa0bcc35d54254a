"use client";
/** Which channels get a pane. */
import { ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";

export const COMPARE_ROLES: ChannelRole[] = [
  "speed_front", "speed_rear", "gps_speed", "throttle", "brake_front", "brake_rear", "engine_rpm", "gear",
  "lean_angle", "fork_travel", "shock_travel", "accel_long", "accel_lat",
];
export const DEFAULT_ROLES: ChannelRole[] = ["speed_front", "throttle", "brake_front", "engine_rpm", "gear", "lean_angle"];

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
