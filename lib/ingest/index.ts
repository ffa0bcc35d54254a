/** Import of logger files: sniff, read the CSV header, suggest a mapping, parse to SI series. */
export { IngestError, INGEST_ERROR_CODES, type IngestErrorCode } from "./ingest-error";
export { LIMITS, LIMIT_STATEMENTS, limitStatements, type IngestLimits } from "./limits";
export { sniffFormat, SNIFF_BYTES, type SniffResult } from "./sniff-format";
export { readCsvHeader, splitNameAndUnit, type CsvColumn, type CsvHeader, type CsvDelimiter } from "./csv-header";
export {
  unitConversion,
  lookupUnit,
  unitsForRole,
  convertToSi,
  ROLE_QUANTITY,
  MPH_TO_MPS,
  KMH_TO_MPS,
  KNOT_TO_MPS,
  BAR_TO_PA,
  PSI_TO_PA,
  INCH_TO_M,
  FOOT_TO_M,
  STANDARD_GRAVITY_MPS2,
  KELVIN_OFFSET,
  RAD_TO_DEG,
  type UnitConversion,
  type Quantity,
} from "./units";
export { suggestMapping, normaliseName, type SuggestedColumn, type MappingSuggestion } from "./suggest-mapping";
export { headerSignature } from "./header-signature";
export { detectTimeFormat } from "./detect-time-format";
export type { Mapping, MappedColumn, TimeFormat } from "./mapping";
export type { ParsedSeries, ParsedChannel, IngestProgress } from "./parsed-series";
export { parseCsvStream } from "./parse-csv-stream";
export { parseCsvText } from "./parse-csv-text";
export { parseGpx } from "./parse-gpx";
export { parseNmea } from "./parse-nmea";
