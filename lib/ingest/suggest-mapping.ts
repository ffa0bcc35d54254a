import type { ChannelRole } from "@/lib/channels/roles";
import type { CsvColumn } from "./csv-header";
import { detectTimeFormat } from "./detect-time-format";
import type { Mapping, MappedColumn, TimeFormat } from "./mapping";
import { lookupUnit, ROLE_QUANTITY, type Quantity } from "./units";

export interface SuggestedColumn extends MappedColumn {
  /** 0–1: how sure the suggestion is (name, unit and values agreeing). */
  confidence: number;
  /** Why, in a few words, for the mapping screen. */
  reason: string;
}

export interface MappingSuggestion extends Mapping {
  columns: SuggestedColumn[];
  timeConfidence: number;
}

/** Lower case; separators _ - . / become spaces; whitespace collapsed. (Also the header-signature key: do not change.) */
export function normaliseName(name: string): string {
  return name
    .toLowerCase()
    .replace(/[_\-./]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();
}

/**
 * Words of a column name as loggers write them: camelCase and digits split off
 * ("WhlSpdF" → whl spd f, "BrkP1" → brk p 1, "GPSLat" → gps lat), lower case.
 */
export function nameTokens(name: string): string[] {
  return name
    .replace(/([a-z])([A-Z])/g, "$1 $2")
    .replace(/([A-Z]+)([A-Z][a-z])/g, "$1 $2")
    .replace(/([A-Za-z])(\d)/g, "$1 $2")
    .replace(/(\d)([A-Za-z])/g, "$1 $2")
    .toLowerCase()
    .replace(/[^a-z0-9%°]+/g, " ")
    .trim()
    .split(" ")
    .filter(Boolean);
}

type Concept =
  | "time" | "speed" | "wheel" | "gps" | "engine" | "rpm" | "throttle" | "brake" | "pressure" | "fork" | "shock"
  | "susp" | "lat" | "lon" | "alt" | "gear" | "beacon" | "temp" | "water" | "tyre" | "lambda" | "accel" | "lean"
  | "axis_x" | "axis_y" | "axis_z" | "front" | "rear" | "left" | "right" | "oil" | "air" | "fuel" | "steer" | "yaw" | "pitch"
  | "volt" | "ground" | "lap" | "count" | "n";

/**
 * Words and abbreviations loggers use (common practice: how exports name channels when space is short).
 * One word may say two things ("rpm": engine rotation; "tps": throttle).
 */
const WORDS: Record<string, Concept[]> = {};
function words(concepts: Concept[], ...ws: string[]) {
  for (const w of ws) WORDS[w] = [...(WORDS[w] ?? []), ...concepts];
}
words(["time"], "time", "timestamp", "tstamp", "ts", "elapsed", "clock", "utc", "tm", "zeit", "systime", "logtime", "sec", "secs");
words(["speed"], "speed", "spd", "sp", "spe", "vel", "velocity", "v", "vspd", "kmh", "mph");
words(["wheel"], "wheel", "whl", "wh", "whe", "wheels");
words(["gps"], "gps", "gnss", "sat", "nav");
words(["ground"], "sog", "ground", "gnd");
words(["engine"], "engine", "eng", "motor", "mot", "crank");
words(["rpm", "engine"], "rpm", "revs", "rev", "revolutions", "tacho", "tach", "nmot", "neng");
words(["n"], "n");
words(["throttle"], "throttle", "thr", "thro", "throt", "thrtl", "thrott", "tps", "tp", "gas", "twistgrip", "grip", "tpos", "aps", "tpl", "thpos");
words(["brake"], "brake", "brakes", "brk", "brak", "br", "bk", "bp", "brkp");
words(["pressure"], "pressure", "press", "pres", "prs", "prss", "p", "bp", "brkp");
words(["fork"], "fork", "frk", "forks");
words(["shock"], "shock", "shk", "damper", "dmp", "mono", "monoshock");
words(["susp"], "susp", "suspension", "sus", "pot", "travel", "trav", "trv", "stroke", "lin", "linpot", "pos", "position", "disp", "displacement", "pot");
words(["lat"], "lat", "latitude", "breite");
words(["lon"], "lon", "lng", "long", "longitude", "laenge");
words(["alt"], "alt", "altitude", "elev", "elevation", "height", "hgt", "msl");
words(["gear"], "gear", "gr", "gea", "gearpos", "gpos", "gearposition", "gears");
words(["beacon"], "beacon", "bcn", "marker", "lapmarker", "lapbeacon", "ir", "trigger", "trig", "lapmark", "lapsig");
words(["lap"], "lap");
words(["temp"], "temp", "tmp", "temperature", "tem", "t");
words(["water"], "water", "wat", "wtr", "h2o", "coolant", "clt", "ect", "cool", "wt");
words(["tyre"], "tyre", "tire", "tyr", "tyres", "tires", "tt");
words(["lambda"], "lambda", "lam", "lmb", "afr", "o2", "lsu", "afratio");
words(["accel"], "accel", "acc", "acceleration", "accn", "g", "ax", "ay", "glong", "glat", "imu");
words(["axis_x"], "x", "ax", "glong", "inline", "fwd", "forward", "longitudinal", "longit");
words(["axis_y"], "y", "ay", "glat", "lateral", "side", "sideways");
words(["axis_z"], "z", "az", "vertical", "vert");
words(["lean"], "lean", "roll", "bank", "banking", "leanangle", "rollangle", "tilt");
words(["front"], "front", "fr", "ft", "frt", "fnt", "f", "fwheel", "frnt");
words(["rear"], "rear", "rr", "r", "rer", "rw", "back", "rwheel");
words(["left"], "left", "l", "lh");
words(["right"], "right", "rh");
words(["oil"], "oil");
words(["air"], "air", "ambient", "amb", "iat", "intake");
words(["fuel"], "fuel", "tank");
words(["front", "left"], "fl", "lf");
words(["rear", "left"], "rl", "lr");
// Three-letter acronyms some loggers use for the usual channels (common practice).
words(["wheel", "speed", "front"], "fws", "fwsp", "vfront");
words(["wheel", "speed", "rear"], "rws", "rwsp", "vrear");
words(["brake", "pressure", "front"], "fbp", "bpf");
words(["brake", "pressure", "rear"], "rbp", "bpr");
words(["susp", "front"], "fsus", "fsusp", "fpot");
words(["susp", "rear"], "rsus", "rsusp", "rpot");
words(["steer"], "steer", "steering", "str");
words(["yaw"], "yaw");
words(["pitch"], "pitch");
words(["volt"], "volt", "volts", "voltage", "batt", "battery", "vbat", "ubat");
words(["count"], "count", "counter", "cnt", "number", "num", "no", "nr");

/** Concepts that name something Lapbench has no role for: such a column stays "Other" unless the name says more. */
const NOT_A_ROLE: Concept[] = ["oil", "air", "fuel", "steer", "yaw", "pitch", "volt"];

interface Evidence {
  role: ChannelRole;
  score: number;
  reason: string;
}

/** Front/rear from the name: words, a leading or trailing F/R, or 1/2 of a sensor pair. */
function sideOf(tokens: string[], has: (c: Concept) => boolean, pairDigit: "1" | "2" | null): "front" | "rear" | null {
  const f = has("front");
  const r = has("rear");
  if (f && !r) return "front";
  if (r && !f) return "rear";
  if (f && r) {
    // "fr" alone reads as front; "f" … "r" both present: the last one wins ("Spd F R"? unlikely) — use the last.
    const last = [...tokens].reverse().find((t) => WORDS[t]?.includes("front") || WORDS[t]?.includes("rear"));
    return last && WORDS[last].includes("rear") && !WORDS[last].includes("front") ? "rear" : "front";
  }
  if (pairDigit === "1") return "front";
  if (pairDigit === "2") return "rear";
  return null;
}

interface ValueFacts {
  count: number;
  min: number;
  max: number;
  integers: boolean;
  distinct: number;
  increasing: boolean;
  maxDecimals: number;
}

function valueFacts(values: string[]): ValueFacts | null {
  const nums: number[] = [];
  let maxDecimals = 0;
  let integers = true;
  for (const raw of values) {
    const v = raw.trim();
    if (v === "") continue;
    const n = Number(v.replace(",", "."));
    if (!Number.isFinite(n)) return null;
    nums.push(n);
    const dec = /[.,](\d+)$/.exec(v)?.[1].length ?? 0;
    if (dec > 0 && !/[.,]0+$/.test(v)) integers = false;
    maxDecimals = Math.max(maxDecimals, dec);
  }
  if (nums.length === 0) return null;
  let increasing = nums.length >= 3;
  for (let i = 1; i < nums.length && increasing; i++) if (!(nums[i] > nums[i - 1])) increasing = false;
  return { count: nums.length, min: Math.min(...nums), max: Math.max(...nums), integers, distinct: new Set(nums).size, increasing, maxDecimals };
}

const side2 = (side: "front" | "rear" | null, front: ChannelRole, rear: ChannelRole): ChannelRole => (side === "rear" ? rear : front);

/** What the name alone says: candidate roles with a score. */
function fromName(tokens: string[], has: (c: Concept) => boolean, side: "front" | "rear" | null, quantity: Quantity | undefined): Evidence[] {
  const out: Evidence[] = [];
  const add = (role: ChannelRole, score: number, reason: string) => out.push({ role, score, reason });
  const sideWord = side ? `, ${side} from the name` : "";
  const only = tokens.length;
  if (has("time") && !has("lap") && !has("temp") || (only === 1 && tokens[0] === "t" && quantity !== "temperature")) add("time", 0.95, "name says time");
  if (has("beacon")) add("lap_beacon", 0.9, "name says lap beacon");
  if (has("gear") && !has("temp") && !has("oil")) add("gear", 0.9, "name says gear");
  if (has("lean")) add("lean_angle", 0.88, "name says lean (roll) angle");
  if (has("lambda")) add("lambda", 0.9, "name says lambda / air-fuel ratio");
  if (has("throttle")) add("throttle", 0.9, "name says throttle");
  if (has("rpm") || (has("engine") && (has("speed") || has("n"))) || (has("n") && only === 1 && quantity === "rotation")) add("engine_rpm", 0.92, "name says engine speed");
  const accelLike = has("accel");
  if (accelLike && !has("axis_z")) {
    if (has("axis_x") || (has("lon") && !has("lat"))) add("accel_long", 0.88, "name says longitudinal acceleration");
    else if (has("axis_y") || has("lat")) add("accel_lat", 0.88, "name says lateral acceleration");
  }
  if (!accelLike) {
    if (has("lat") && !has("lon")) add("gps_lat", has("gps") ? 0.95 : 0.85, "name says latitude");
    if (has("lon") && !has("lat") && !(has("accel") || has("axis_x"))) add("gps_lon", has("gps") ? 0.95 : 0.85, "name says longitude");
    if (has("alt")) add("gps_alt", 0.88, "name says altitude");
  }
  if (has("speed") && !has("engine") && !has("rpm") && !has("wheel") && (has("gps") || has("ground"))) add("gps_speed", 0.95, "name says GPS / ground speed");
  if ((has("speed") || has("wheel")) && !has("susp") && !has("fork") && !has("shock") && !has("engine") && !has("rpm") && !has("gps") && !has("ground") && !has("temp") && !has("yaw")) {
    if (side) add(side2(side, "speed_front", "speed_rear"), has("wheel") || has("speed") ? 0.92 : 0.7, `name says wheel speed${sideWord}`);
    else if (has("wheel")) add("speed_front", 0.55, "name says wheel speed, front or rear not said");
    else if (only <= 2) add("gps_speed", 0.5, "name says speed, no wheel named: read as ground speed");
  }
  if (has("brake") && !has("temp")) add(side2(side, "brake_front", "brake_rear"), side ? 0.92 : 0.75, `name says brake${sideWord || ", front or rear not said"}`);
  if (has("tyre") && (has("temp") || quantity === "temperature")) add(side2(side, "tyre_temp_front", "tyre_temp_rear"), side ? 0.9 : 0.6, `name says tyre temperature${sideWord}`);
  if (has("water")) add("water_temp", 0.88, "name says coolant");
  if (has("fork")) add("fork_travel", 0.9, "name says fork");
  if (has("shock")) add("shock_travel", 0.9, "name says shock");
  if (has("susp") && !has("fork") && !has("shock") && !has("throttle") && !has("gear") && !has("lat") && !has("lon") && side)
    add(side2(side, "fork_travel", "shock_travel"), 0.82, `name says suspension travel${sideWord}`);
  return out;
}

/** What the unit alone says, when the name does not decide. */
function fromUnit(q: Quantity, unitLabel: string, side: "front" | "rear" | null, has: (c: Concept) => boolean, facts: ValueFacts | null): Evidence[] {
  const out: Evidence[] = [];
  const add = (role: ChannelRole, score: number, reason: string) => out.push({ role, score, reason: `unit ${unitLabel}${reason}` });
  const sideWord = side ? ` and ${side} from the name` : "";
  switch (q) {
    case "time":
      add("time", 0.8, " is a time");
      break;
    case "rotation":
      add("engine_rpm", 0.8, ": a column in rpm is almost always engine speed");
      break;
    case "percent":
      if (!facts || (facts.min >= -1 && facts.max <= 101)) add("throttle", 0.6, ", values within 0–100 %: usually throttle");
      break;
    case "pressure":
      add(side2(side, "brake_front", "brake_rear"), side ? 0.8 : 0.55, `${sideWord}: a pressure channel is usually brake pressure`);
      break;
    case "speed":
      if (side) add(side2(side, "speed_front", "speed_rear"), 0.75, `${sideWord}: wheel speed`);
      else add("gps_speed", 0.45, ": a speed, no wheel named");
      break;
    case "length":
      if (side && (unitLabel === "mm" || unitLabel === "in" || unitLabel === "cm")) add(side2(side, "fork_travel", "shock_travel"), 0.75, `${sideWord}: suspension travel`);
      else if (unitLabel === "m" || unitLabel === "ft") add("gps_alt", 0.45, ": a height");
      break;
    case "temperature":
      if (side) add(side2(side, "tyre_temp_front", "tyre_temp_rear"), 0.6, `${sideWord}: tyre temperature`);
      else if (!has("tyre")) add("water_temp", 0.45, ": the one engine temperature Lapbench reads is coolant");
      break;
    case "lambda":
      add("lambda", 0.85, " is lambda / air-fuel ratio");
      break;
    case "acceleration":
      if (has("axis_x") || has("lon")) add("accel_long", 0.8, ", x / longitudinal");
      else if (has("axis_y") || has("lat")) add("accel_lat", 0.8, ", y / lateral");
      break;
    case "angle":
      if (facts && isGpsLike(facts)) add(facts.max > 90 || facts.min < -90 ? "gps_lon" : "gps_lat", 0.55, ", values look like GPS degrees");
      else add("lean_angle", 0.45, ": an angle; lean is the angle Lapbench reads");
      break;
    default:
      break;
  }
  return out;
}

/** Degrees of a position: many decimals, little spread over the first rows. */
function isGpsLike(f: ValueFacts): boolean {
  return f.maxDecimals >= 4 && Math.abs(f.max) <= 180 && Math.abs(f.min) <= 180 && f.max - f.min < 0.05 && Math.abs(f.min) > 0.001;
}

/** What the values alone say, when neither name nor unit does. */
function fromValues(f: ValueFacts, isFirst: boolean): Evidence[] {
  const out: Evidence[] = [];
  if (f.increasing && isFirst) out.push({ role: "time", score: 0.6, reason: "first column, values always increasing: time" });
  if (isGpsLike(f)) out.push({ role: Math.abs(f.max) > 90 || Math.abs(f.min) > 90 ? "gps_lon" : "gps_lat", score: 0.4, reason: "values look like GPS degrees" });
  if (f.integers && f.min >= 0 && f.max <= 1 && f.count >= 3) out.push({ role: "lap_beacon", score: 0.3, reason: "values only 0 and 1: a beacon" });
  if (f.integers && f.min >= 0 && f.max <= 7 && f.max >= 1 && f.distinct <= 7) out.push({ role: "gear", score: 0.3, reason: "whole numbers 0–7: gear steps" });
  if (f.min >= 500 && f.max <= 22000 && f.min > 0) out.push({ role: "engine_rpm", score: 0.4, reason: "values 500–22 000: rpm-like" });
  return out;
}

/** Units to assume when the header gives none. */
const DEFAULT_UNIT: Partial<Record<ChannelRole, string>> = {
  gps_lat: "deg",
  gps_lon: "deg",
  engine_rpm: "rpm",
  throttle: "%",
  lean_angle: "deg",
};

/**
 * Suggest a role and unit for each column from everything the file says: the name (with common
 * abbreviations and front/rear markers — F/R, Fr/Rr, front/rear, ft/rr, or 1/2 of a sensor pair),
 * the unit in the header, and the first values (range, resolution, increasing time, a 0/1 beacon,
 * whole gear steps, GPS-like degrees, rpm-like magnitudes). Each role goes to the column with the
 * strongest evidence; the rest become "other". The time format comes from the time column's unit
 * and first values (`sampleRows`, as readCsvHeader returns them).
 */
export function suggestMapping(columns: CsvColumn[], sampleRows: string[][] = []): MappingSuggestion {
  // Sensor pairs "Brk 1" / "Brk 2": the same stem with 1 and 2 reads as front and rear.
  const stems = new Map<string, Set<string>>();
  const tokenised = columns.map((col) => {
    const tokens = nameTokens(col.name);
    const last = tokens[tokens.length - 1];
    const stem = tokens.slice(0, -1).join(" ");
    if ((last === "1" || last === "2") && stem) stems.set(stem, (stems.get(stem) ?? new Set()).add(last));
    return tokens;
  });

  const candidates: { col: number; ev: Evidence }[] = [];
  const info = columns.map((col, k) => {
    const tokens = tokenised[k];
    const concepts = new Set<Concept>(tokens.flatMap((t) => WORDS[t] ?? []));
    if (concepts.has("air") && concepts.has("fuel")) concepts.add("lambda"); // "air-fuel ratio"
    const has = (c: Concept) => concepts.has(c);
    const last = tokens[tokens.length - 1];
    const stem = tokens.slice(0, -1).join(" ");
    const pairDigit = (last === "1" || last === "2") && stems.get(stem)?.size === 2 ? (last as "1" | "2") : null;
    const side = sideOf(tokens, has, pairDigit);
    const known = col.unit ? lookupUnit(col.unit) : undefined;
    const facts = valueFacts(sampleRows.map((r) => r[col.index] ?? ""));
    const namesNoRole = NOT_A_ROLE.some((c) => has(c)) && !has("lambda");
    const nameEv = namesNoRole ? [] : fromName(tokens, has, side, known?.quantity);
    const fits = (role: ChannelRole) => {
      const q = ROLE_QUANTITY[role];
      if (!known || !q) return true;
      if (known.quantity === q) return true;
      // GPS degrees are an angle; a count role (gear, beacon) takes any unitless number.
      return false;
    };
    const list: Evidence[] = [];
    for (const e of nameEv) {
      if (!fits(e.role)) continue;
      list.push(known ? { ...e, score: Math.min(1, e.score + 0.05), reason: `${e.reason}, unit ${known.unit}` } : e);
    }
    // The name names a channel Lapbench has no role for ("Oil temp", "Batt V"), or a role the unit contradicts ("Fork [bar]").
    const nameSaysOther = namesNoRole || (nameEv.length > 0 && list.length === 0);
    if (known && !nameSaysOther) {
      for (const e of fromUnit(known.quantity, known.unit, side, has, facts)) if (!list.some((x) => x.role === e.role)) list.push(e);
    }
    if (facts && !known && nameEv.length === 0 && !nameSaysOther && !col.unit) {
      for (const e of fromValues(facts, k === 0)) list.push(e);
    }
    // Values confirm or weaken what name and unit said.
    if (facts) {
      for (const e of list) {
        if (e.role === "engine_rpm" && facts.max > 0 && facts.max < 100 && !known) e.score -= 0.3;
        if (e.role === "gear" && !facts.integers) e.score -= 0.4;
        if (e.role === "lap_beacon" && !(facts.integers && facts.min >= 0 && facts.max <= 1)) e.score -= 0.2;
        if ((e.role === "gps_lat" || e.role === "gps_lon") && isGpsLike(facts)) e.score += 0.03;
        if (e.role === "time" && facts.increasing) e.score += 0.03;
      }
    }
    for (const ev of list) candidates.push({ col: k, ev });
    return { known };
  });

  // Strongest evidence first; one column per role, one role per column.
  candidates.sort((a, b) => b.ev.score - a.ev.score || a.col - b.col);
  const chosen = new Map<number, Evidence>();
  const taken = new Set<ChannelRole>();
  for (const c of candidates) {
    if (c.ev.score < 0.25 || chosen.has(c.col) || taken.has(c.ev.role)) continue;
    chosen.set(c.col, c.ev);
    taken.add(c.ev.role);
  }

  const out: SuggestedColumn[] = columns.map((col, k) => {
    const ev = chosen.get(k);
    if (!ev) {
      const lost = candidates.find((c) => c.col === k && c.ev.score >= 0.25);
      const reason = lost ? `${lost.ev.reason}, but another column fits ${lost.ev.role.replace(/_/g, " ")} better` : "no role recognised from the name, unit or values";
      return { index: col.index, name: col.name, role: "other", unit: col.unit, scale: 1, offset: 0, confidence: 0.2, reason };
    }
    const quantity = ROLE_QUANTITY[ev.role];
    const known = info[k].known;
    let confidence = ev.score;
    let reason = ev.reason;
    if (col.unit && !known && quantity !== "count" && quantity !== "lambda" && ev.role !== "time") {
      confidence *= 0.5;
      reason += `, unit '${col.unit}' not known`;
    }
    const unit = ev.role === "time" ? col.unit : col.unit || DEFAULT_UNIT[ev.role] || "";
    if (!col.unit && ev.role !== "time" && !DEFAULT_UNIT[ev.role] && quantity !== "count" && quantity !== "lambda") {
      confidence *= 0.6;
      reason += ", no unit given: choose one";
    }
    return { index: col.index, name: col.name, role: ev.role, unit, scale: 1, offset: 0, confidence: round2(Math.max(0, Math.min(1, confidence))), reason };
  });

  const timeCol = out.find((c) => c.role === "time");
  let timeFormat: TimeFormat = "seconds";
  let timeConfidence = 0;
  if (timeCol) {
    const firstValues = sampleRows.map((r) => r[timeCol.index] ?? "");
    const detected = detectTimeFormat(timeCol.unit, firstValues);
    timeFormat = detected.format;
    timeConfidence = detected.confidence;
    timeCol.unit = timeFormat === "milliseconds" ? "ms" : timeFormat === "seconds" ? "s" : "";
  }
  return { columns: out, timeFormat, timeConfidence };
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}
