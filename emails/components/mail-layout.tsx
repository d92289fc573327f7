import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";

const colors = { paper: "#f6f1e7", ink: "#2a2320", accent: "#9c3d1c", muted: "#6b5f55", rule: "#d9cdb8" };

export function MailLayout({ preview, children }: { preview: string; children: ReactNode }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: colors.paper, color: colors.ink, fontFamily: "Helvetica, Arial, sans-serif", margin: 0 }}>
        <Container style={{ maxWidth: 560, margin: "0 auto", padding: "28px 20px" }}>
          <Text style={{ fontSize: 13, letterSpacing: 2, textTransform: "uppercase", color: colors.accent, margin: 0 }}>
            Kestrel Lane Wireless · Bandedge
          </Text>
          <Section
            style={{ backgroundColor: "#ffffff", border: `1px solid ${colors.rule}`, borderRadius: 6, padding: "20px 24px", marginTop: 12 }}
          >
            {children}
          </Section>
          <Hr style={{ borderColor: colors.rule, marginTop: 24 }} />
          <Text style={{ fontSize: 12, color: colors.muted }}>
            You receive this because you have an account or a job with the shop. Replies to this address reach the workshop.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

export const mailStyles = {
  h1: { fontSize: 20, margin: "0 0 12px", color: colors.ink },
  p: { fontSize: 15, lineHeight: "22px", margin: "0 0 12px" },
  button: {
    backgroundColor: colors.accent,
    color: "#ffffff",
    padding: "10px 18px",
    borderRadius: 4,
    fontSize: 15,
    textDecoration: "none",
    display: "inline-block",
  },
  small: { fontSize: 13, color: colors.muted, margin: "12px 0 0" },
};
