import type { ChannelRow } from "@/lib/data/session-overview";

/** The session's channels, values in display units (km/h, bar, mm…), stored in SI. */
export function ChannelTable({ channels }: { channels: ChannelRow[] }) {
  if (channels.length === 0) return <p className="text-sm text-ink-400">No channels stored.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="table-plain" data-testid="channel-table">
        <thead>
          <tr>
            <th>Channel</th>
            <th>Role</th>
            <th>Unit</th>
            <th className="text-right">Rate</th>
            <th className="text-right">Samples</th>
            <th className="text-right">Min</th>
            <th className="text-right">Max</th>
          </tr>
        </thead>
        <tbody>
          {channels.map((c) => (
            <tr key={c.id}>
              <td className="font-medium">{c.name}</td>
              <td className="text-ink-300">{c.roleLabel}</td>
              <td className="text-ink-300">{c.unit || "—"}</td>
              <td className="num text-right">{c.rateHz != null ? `${c.rateHz >= 10 ? c.rateHz.toFixed(0) : c.rateHz.toFixed(1)} Hz` : "—"}</td>
              <td className="num text-right">{c.samples.toLocaleString("en-GB")}</td>
              <td className="num text-right">{c.min}</td>
              <td className="num text-right">{c.max}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
