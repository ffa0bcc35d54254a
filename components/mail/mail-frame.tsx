/** The frame every Lapbench e-mail shares (React components rendered by @react-email/render). */
import type { ReactNode } from "react";
import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";

export const mailStyles = {
  body: { backgroundColor: "#f4f5f7", fontFamily: "Helvetica, Arial, sans-serif", color: "#13171d" },
  container: { backgroundColor: "#ffffff", padding: "24px", maxWidth: "560px", margin: "24px auto", borderRadius: "6px" },
  h1: { fontSize: "20px", margin: "0 0 12px" },
  small: { fontSize: "12px", color: "#5b6675" },
  cell: { padding: "4px 8px", borderBottom: "1px solid #e4e8ed", fontSize: "14px", textAlign: "left" as const },
  button: { backgroundColor: "#f59e1b", color: "#0d1014", padding: "10px 16px", borderRadius: "6px", fontWeight: 600, textDecoration: "none" },
};

export function MailFrame({ preview, teamName, children, footer }: { preview: string; teamName: string; children: ReactNode; footer: string }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={mailStyles.body}>
        <Container style={mailStyles.container}>
          <Text style={mailStyles.small}>Lapbench · {teamName}</Text>
          {children}
          <Hr />
          <Section>
            <Text style={mailStyles.small}>{footer}</Text>
          </Section>
        </Container>
      </Body>
    </Html>
  );
}
