/** "Session ready": to the rider with their brief summary, to engineers with the findings count. */
import { Button, Heading, Section, Text } from "@react-email/components";
import { MailFrame, mailStyles } from "./mail-frame";

export interface SessionReadyMailProps {
  audience: "rider" | "engineer";
  teamName: string;
  sessionTitle: string;
  riderName: string | null;
  bikeName: string | null;
  url: string;
  bestLap: string | null;
  bestThreeMean: string | null;
  flyingLaps: number;
  topSpeed: string | null;
  /** The rider brief's plain sentences, largest braking differences first. */
  briefLines: string[];
  findingsCount: number;
  settingsUrl: string;
}

export function SessionReadyMail(p: SessionReadyMailProps) {
  const who = [p.riderName, p.bikeName].filter(Boolean).join(" on ");
  const rider = p.audience === "rider";
  return (
    <MailFrame
      teamName={p.teamName}
      preview={rider ? `${p.sessionTitle} is ready: best lap ${p.bestLap ?? "—"}` : `${p.sessionTitle} is ready: ${p.findingsCount} findings`}
      footer={`You get this because "session ready" e-mails are on in your settings: ${p.settingsUrl}`}
    >
      <Heading as="h1" style={mailStyles.h1}>
        {p.sessionTitle} is ready
      </Heading>
      {who && <Text>{who}</Text>}
      <Section>
        <Text>
          Best lap: {p.bestLap ?? "no complete flying lap"}
          <br />
          Best-three mean: {p.bestThreeMean ?? "fewer than three flying laps"}
          <br />
          Flying laps: {p.flyingLaps}
          <br />
          Top speed: {p.topSpeed ?? "not recorded"}
          <br />
          Findings: {p.findingsCount}
        </Text>
      </Section>
      {rider && (
        <Section>
          <Text style={{ fontWeight: 600 }}>Your brief</Text>
          {p.briefLines.length === 0 ? <Text>No braking differences to the best lap to report.</Text> : p.briefLines.map((l, i) => <Text key={i}>• {l}</Text>)}
        </Section>
      )}
      {!rider && p.findingsCount > 0 && (
        <Text>
          {p.findingsCount} {p.findingsCount === 1 ? "finding waits" : "findings wait"} for review. A finding about brakes, suspension or engine limits is a symptom, not a diagnosis: inspect the part before the bike goes out again.
        </Text>
      )}
      <Section style={{ margin: "16px 0" }}>
        <Button href={p.url} style={mailStyles.button}>
          {rider ? "Open your rider brief" : "Open the session"}
        </Button>
      </Section>
      <Text style={mailStyles.small}>Link: {p.url}</Text>
    </MailFrame>
  );
}
