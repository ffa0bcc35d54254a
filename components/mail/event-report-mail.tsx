/** The owner's report after an event: best laps per rider, findings, engine use. */
import { Button, Heading, Section, Text } from "@react-email/components";
import { MailFrame, mailStyles } from "./mail-frame";

export interface EventReportMailProps {
  teamName: string;
  eventName: string;
  dates: string;
  trackName: string | null;
  url: string;
  bestLaps: { rider: string; bike: string; bestLap: string; bestThreeMean: string; session: string }[];
  findings: { open: number; acknowledged: number };
  engines: { serial: string; hours: string; km: string; overRevs: number; usedPct: string | null }[];
}

export function EventReportMail(p: EventReportMailProps) {
  return (
    <MailFrame teamName={p.teamName} preview={`${p.eventName}: best laps, findings and engine use`} footer="You get this because event reports are on in your settings.">
      <Heading as="h1" style={mailStyles.h1}>
        Event report: {p.eventName}
      </Heading>
      <Text>
        {p.dates}
        {p.trackName ? ` · ${p.trackName}` : ""}
      </Text>
      <Section>
        <Text style={{ fontWeight: 600 }}>Best laps</Text>
        {p.bestLaps.length === 0 ? (
          <Text>No analysed laps.</Text>
        ) : (
          <table cellPadding={0} cellSpacing={0} style={{ width: "100%", borderCollapse: "collapse" }}>
            <thead>
              <tr>
                <th style={mailStyles.cell}>Rider</th>
                <th style={mailStyles.cell}>Bike</th>
                <th style={mailStyles.cell}>Best lap</th>
                <th style={mailStyles.cell}>Best-3 mean</th>
              </tr>
            </thead>
            <tbody>
              {p.bestLaps.map((b) => (
                <tr key={`${b.rider}-${b.bike}`}>
                  <td style={mailStyles.cell}>{b.rider}</td>
                  <td style={mailStyles.cell}>{b.bike}</td>
                  <td style={mailStyles.cell}>{b.bestLap}</td>
                  <td style={mailStyles.cell}>{b.bestThreeMean}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Section>
      <Section>
        <Text style={{ fontWeight: 600 }}>Findings</Text>
        <Text>
          {p.findings.open} open, {p.findings.acknowledged} acknowledged.
        </Text>
      </Section>
      <Section>
        <Text style={{ fontWeight: 600 }}>Engine use</Text>
        {p.engines.length === 0 ? (
          <Text>No engine recorded on the sessions.</Text>
        ) : (
          p.engines.map((e) => (
            <Text key={e.serial}>
              {e.serial}: {e.hours} h, {e.km} km at this event, {e.overRevs} over-revs{e.usedPct ? `; ${e.usedPct} of its rebuild interval used` : ""}
            </Text>
          ))
        )}
      </Section>
      <Section style={{ margin: "16px 0" }}>
        <Button href={p.url} style={mailStyles.button}>
          Open the event report
        </Button>
      </Section>
      <Text style={mailStyles.small}>Link: {p.url}</Text>
    </MailFrame>
  );
}
