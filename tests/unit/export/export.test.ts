import Papa from "papaparse";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { lapTableCsv } from "@/lib/export/lap-table-csv";
import { GPX_NS, lapToGpx } from "@/lib/export/lap-to-gpx";
import type { Lap } from "@/lib/laps/types";
import { at } from "../../fixtures/at";

const LAPS: Lap[] = [
  { number: 1, startTimeS: 3.2, endTimeS: 101.5, lapTimeMs: 98300, sectorTimesMs: [null, 40000, 58300], outLap: true, inLap: false, pitPass: false, complete: false },
  { number: 2, startTimeS: 101.5, endTimeS: 184.9564, lapTimeMs: 83456, sectorTimesMs: [25000, 30000, 28456], outLap: false, inLap: false, pitPass: false, complete: true },
];

describe("formatLapTime", () => {
  it.each([
    [83456, "1:23.456"],
    [59999, "0:59.999"],
    [600000, "10:00.000"],
    [5, "0:00.005"],
    [null, ""],
    [-1, ""],
  ])("%s ms → %s", (ms, text) => expect(formatLapTime(ms)).toBe(text));
});

describe("lapTableCsv", () => {
  it("writes units in the headers and times as m:ss.SSS and ms", () => {
    const csv = lapTableCsv(LAPS);
    const rows = Papa.parse<string[]>(csv.trim()).data;
    expect(rows[0]).toEqual(["Lap", "Lap time [m:ss.SSS]", "Lap time [ms]", "Sector 1 [ms]", "Sector 2 [ms]", "Sector 3 [ms]", "Start [s]", "End [s]", "Flags", "Note"]);
    expect(rows[2]).toEqual(["2", "1:23.456", "83456", "25000", "30000", "28456", "101.5", "184.956", "", ""]);
    expect(at(rows, 1)[3]).toBe(""); // unknown sector: empty, not a dash
    expect(at(rows, 1)[8]).toBe("out-lap partial");
  });

  it("neutralises text cells starting with = + - @ tab CR LF with a single quote (OWASP CSV injection)", () => {
    const evil = ["=HYPERLINK(\"x\")", "+1+1", "-2+3", "@SUM(A1)", "\tx", "\rx", "=1+1\nsecond line", "plain note"];
    const csv = lapTableCsv(LAPS.slice(0, 1), { sessionLabel: "=cmd|' /C calc'!A0", notes: { 1: evil.join("") } });
    const rows = Papa.parse<string[]>(csv.trim()).data;
    expect(at(rows, 1)[0]).toBe("'=cmd|' /C calc'!A0");
    for (const text of evil) {
      const c = lapTableCsv(LAPS.slice(0, 1), { notes: { 1: text } });
      const cell = at(at(Papa.parse<string[]>(c.trim(), { newline: "\r\n" }).data, 1), 9);
      if (text === "plain note") expect(cell).toBe(text);
      else expect(cell).toBe("'" + text);
    }
    // Numbers are written as numbers, never quoted.
    expect(csv).toContain(",98300,");
  });
});

describe("lapToGpx", () => {
  const fixes = {
    timeS: Float64Array.from([100, 101.5, 102.25, 184.9, 190]),
    latDeg: Float64Array.from([44.5, 44.50001, 44.50002, NaN, 44.5]),
    lonDeg: Float64Array.from([-30, -30.00001, -30.00002, -30, -30]),
    altM: Float64Array.from([12, 12.5, 13, 13, 13]),
  };

  it("produces valid GPX 1.1 with the lap's fixes and ISO 8601 UTC times", () => {
    const xml = lapToGpx(at(LAPS, 1), fixes, { sessionStartedAt: new Date("2031-05-04T09:30:00.000Z"), name: "Session 2 & <test> – Lap 2" });
    expect(XMLValidator.validate(xml)).toBe(true);
    const doc = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "" }).parse(xml);
    expect(doc.gpx.version).toBe("1.1");
    expect(doc.gpx.xmlns).toBe(GPX_NS);
    expect(xml).toContain("Session 2 &amp; &lt;test&gt; – Lap 2"); // escaped in the file
    expect(doc.gpx.trk.name).toBe("Session 2 & <test> – Lap 2"); // and read back intact
    const pts = doc.gpx.trk.trkseg.trkpt;
    expect(pts).toHaveLength(2); // 101.5 and 102.25 (100 is before the lap, the NaN fix dropped, 190 after)
    expect(pts[0].time).toBe("2031-05-04T09:31:41.500Z"); // 09:30:00 + 101.5 s
    expect(pts[1].time).toBe("2031-05-04T09:31:42.250Z");
    expect(String(pts[1].lat)).toBe("44.5000200");
    expect(Number(pts[1].ele)).toBe(13);
    expect(doc.gpx.metadata.time).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
  });
});
