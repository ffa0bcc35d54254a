/**
 * The invented demo team, its riders and bikes: one list read by the sample-log generator (the
 * header lines of the files it writes) and by the seed (the team, riders and bikes it files those
 * sessions under), so a demo file names the same team, rider and bike the app shows it with.
 * Every name here is invented.
 */
export const DEMO_ROSTER = {
  team: { name: "Larkspur Vale Racing", slug: "larkspur-vale" },
  riders: {
    a: { name: "Ilka Stroud", raceNumber: "27" },
    b: { name: "Jory Penhallow", raceNumber: "64" },
  },
  bikes: {
    a: { name: "Bike 27", engineSerial: "LV-E101", engineNotes: "Fresh build for the season opener" },
    b: { name: "Bike 64", engineSerial: "LV-E102", engineNotes: null },
  },
} as const;

export type DemoRiderKey = keyof typeof DEMO_ROSTER.riders;
export type DemoBikeName = (typeof DEMO_ROSTER.bikes)[keyof typeof DEMO_ROSTER.bikes]["name"];
