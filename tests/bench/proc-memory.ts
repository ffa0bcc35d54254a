/** Memory figures of a process from /proc (Linux): VmHWM is the kernel's own peak-RSS record. */
import fs from "node:fs";
import { at } from "../fixtures/at";

/** A field of /proc/<pid>/status in MB (1 MB = 2^20 bytes), or NaN when the process is gone. */
export function procStatusMb(pid: number, field: "VmHWM" | "VmRSS"): number {
  try {
    const status = fs.readFileSync(`/proc/${pid}/status`, "utf8");
    const m = new RegExp(`^${field}:\\s+(\\d+) kB`, "m").exec(status);
    return m ? Number(m[1]) / 1024 : NaN;
  } catch {
    return NaN;
  }
}

export function median(xs: number[]): number {
  const s = xs.filter((x) => !Number.isNaN(x)).sort((a, b) => a - b);
  if (s.length === 0) return NaN;
  const mid = s.length >> 1;
  return s.length % 2 ? at(s, mid) : (at(s, mid - 1) + at(s, mid)) / 2;
}
