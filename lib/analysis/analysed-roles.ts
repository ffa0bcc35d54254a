import type { ChannelRole } from "@/lib/channels/roles";
import { FINDINGS_READS } from "@/lib/findings/run-findings";
import { ANALYSE_SERIES_READS } from "./analyse-series";
import { BASE_ROLES, PAGE_ROLES } from "./analysis-base";

/**
 * The channel roles the analysis reads, as the union of what each part declares: analyseSeries,
 * every findings detector, and the pages stored at ingest (Drive slip, Suspension use, Gears,
 * Rider brief, with the base every page needs). Ingest keeps exactly these channels in memory and
 * re-analysis loads exactly these from the stored chunks, so both see the same series; a detector
 * that reads a new role declares it beside itself and both pick it up.
 */
export const ANALYSED_ROLES: ReadonlySet<ChannelRole> = new Set<ChannelRole>([
  ...ANALYSE_SERIES_READS,
  ...FINDINGS_READS,
  ...BASE_ROLES,
  ...Object.values(PAGE_ROLES).flat(),
]);
