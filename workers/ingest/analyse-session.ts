/**
 * The analysis that runs at ingest, inside the session's write transaction. Laps, findings and
 * derived channels are added here as they land; each writes only rows of this session.
 */
import type { Sequelize, Transaction } from "sequelize";
import type { RideSession } from "../../models";
import type { ParsedSeries } from "../../lib/ingest/parsed-series";

export async function analyseAndStore(_sequelize: Sequelize, _t: Transaction, _session: RideSession, _parsed: ParsedSeries): Promise<void> {
  // Laps and findings need the track and computations of lib/laps and lib/findings.
}
