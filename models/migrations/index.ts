/**
 * The ordered list of versioned migrations. Add a file `NNNN-name.ts` exporting `up`/`down` and
 * list it here; umzug records what ran in the `lapbench_migrations` table.
 */
import type { QueryInterface } from "sequelize";
import * as auth from "./0001-auth";
import * as domain from "./0002-domain";
import * as storedAnalysis from "./0003-stored-analysis";
import * as logFileHash from "./0010-log-file-hash";
import * as uploadGrants from "./0020-upload-grants";
import * as teamRecord from "./0030-team-record";
import * as analysisVersion from "./0040-analysis-version";
import * as bikeFrontCrownTrackZone from "./0015-bike-front-crown-track-zone";
import * as topSpeedMps from "./0055-top-speed-mps";

export interface Migration {
  name: string;
  up: (p: { context: QueryInterface }) => Promise<void>;
  down: (p: { context: QueryInterface }) => Promise<void>;
}

export const migrations: Migration[] = [
  { name: "0001-auth", ...auth },
  { name: "0002-domain", ...domain },
  { name: "0003-stored-analysis", ...storedAnalysis },
  { name: "0010-log-file-hash", ...logFileHash },
  { name: "0015-bike-front-crown-track-zone", ...bikeFrontCrownTrackZone },
  { name: "0020-upload-grants", ...uploadGrants },
  { name: "0030-team-record", ...teamRecord },
  { name: "0040-analysis-version", ...analysisVersion },
  { name: "0055-top-speed-mps", ...topSpeedMps },
];
