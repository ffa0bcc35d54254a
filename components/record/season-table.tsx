"use client";
/**
 * The season's sessions as one table: sorting and paging by @tanstack/react-table (headless; the
 * markup is ours). Opens sorted by event date, then start time — events in date order, each
 * with its sessions.
 */
import { useMemo, useState } from "react";
import Link from "next/link";
import { createColumnHelper, flexRender, getCoreRowModel, getPaginationRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import type { SeasonRow } from "@/lib/data/season-record";
import { formatLapTime } from "@/lib/export/format-lap-time";
import type { DisplayUnit } from "@/lib/units/display";

const col = createColumnHelper<SeasonRow>();

function speed(ms: number | null, u: DisplayUnit): string {
  return ms == null ? "—" : `${(ms * u.factor).toFixed(1)} ${u.unit}`;
}

export function SeasonTable({ rows, speedUnit, pageSize = 25 }: { rows: SeasonRow[]; speedUnit: DisplayUnit; pageSize?: number }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "event", desc: false }]);
  const columns = useMemo(
    () => [
      col.accessor((r) => `${r.eventDate ?? "9999"} ${r.startedAt ?? ""}`, {
        id: "event",
        header: "Event",
        cell: (c) => (
          <span>
            {c.row.original.eventName ?? "No event"}
            <span className="block text-xs text-ink-400 num">{c.row.original.eventDate ?? ""}</span>
          </span>
        ),
      }),
      col.accessor("title", {
        header: "Session",
        cell: (c) => (
          <Link className="text-signal-400 hover:underline" href={`/sessions/${c.row.original.sessionId}`}>
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor("trackName", { header: "Track", cell: (c) => c.getValue() ?? "—" }),
      col.accessor("riderName", { header: "Rider", cell: (c) => c.getValue() ?? "—" }),
      col.accessor("bikeName", { header: "Bike", cell: (c) => c.getValue() ?? "—" }),
      col.accessor("bestLapMs", { header: "Best lap", sortUndefined: "last", cell: (c) => <span className="num">{formatLapTime(c.getValue()) || "—"}</span> }),
      col.accessor("bestThreeMeanMs", { header: "Best-3 mean", sortUndefined: "last", cell: (c) => <span className="num">{formatLapTime(c.getValue()) || "—"}</span> }),
      col.accessor("topSpeedMps", { header: "Top speed", cell: (c) => <span className="num">{speed(c.getValue(), speedUnit)}</span> }),
      col.accessor("conditions", { header: "Conditions", enableSorting: false, cell: (c) => c.getValue() ?? "—" }),
      col.accessor("setupVersion", { header: "Setup", cell: (c) => (c.getValue() == null ? "—" : <span className="num">v{c.getValue()}</span>) }),
      col.accessor("findingsOpen", {
        header: "Findings open / ack.",
        cell: (c) => (
          <span className="num">
            {c.getValue()} / {c.row.original.findingsAcknowledged}
          </span>
        ),
      }),
    ],
    [speedUnit],
  );
  // eslint-disable-next-line react-hooks/incompatible-library -- known false positive of the React Compiler rule for TanStack Table: this component is not memoised by the compiler and passes the table to nothing memoised.
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    // Quickest first on the first click: lap times read best ascending (the library would start numbers descending).
    sortDescFirst: false,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize } },
  });
  const p = table.getState().pagination;
  return (
    <div>
      <div className="overflow-x-auto">
        <table className="table-plain" data-testid="season-table">
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const dir = h.column.getIsSorted();
                  return (
                    <th key={h.id} aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : undefined}>
                      {h.column.getCanSort() ? (
                        <button type="button" className="uppercase hover:text-ink-100" onClick={h.column.getToggleSortingHandler()}>
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          {dir === "asc" ? " ▲" : dir === "desc" ? " ▼" : ""}
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} data-testid="season-row" data-session={r.original.sessionId}>
                {r.getVisibleCells().map((c) => (
                  <td key={c.id}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {table.getPageCount() > 1 && (
        <div className="mt-3 flex items-center gap-3 text-sm" data-testid="season-pager">
          <button type="button" className="btn-quiet" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            Previous
          </button>
          <span className="text-ink-300">
            Page {p.pageIndex + 1} of {table.getPageCount()} ({rows.length} sessions)
          </span>
          <button type="button" className="btn-quiet" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next
          </button>
        </div>
      )}
    </div>
  );
}
