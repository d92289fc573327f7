import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type StaffNoticeProps = {
  name: string;
  /** What happened, in a line (also the subject). */
  title: string;
  /** A few lines more: the set, the amount, the owner's own words. Never a workshop note. */
  body: string;
  kindLabel: string;
  url: string;
  linkLabel: string;
  preferencesUrl: string;
};

export default function StaffNotice({
  name = "Tomas",
  title = "New quote request KL-0042: Aurelian 5T-48",
  body = "Hums loudly, then the dial lamp goes out after ten minutes.",
  kindLabel = "New quote request",
  url = "http://127.0.0.1:3000/bench/jobs/example",
  linkLabel = "Open the job",
  preferencesUrl = "http://127.0.0.1:3000/staff/profile",
}: Partial<StaffNoticeProps>) {
  return (
    <MailLayout preview={title}>
      <Text style={{ ...mailStyles.small, margin: "0 0 8px", textTransform: "uppercase", letterSpacing: 1 }}>{kindLabel}</Text>
      <Heading style={mailStyles.h1}>{title}</Heading>
      <Text style={mailStyles.p}>Hello {name},</Text>
      {body ? (
        <Text style={{ ...mailStyles.p, borderLeft: "3px solid #d9cdb8", paddingLeft: 12, whiteSpace: "pre-line" }}>{body}</Text>
      ) : null}
      <Button href={url} style={mailStyles.button}>
        {linkLabel}
      </Button>
      <Text style={mailStyles.small}>
        You receive this because it is switched on for you under Notifications on your staff profile:{" "}
        <a href={preferencesUrl}>choose what reaches you by e-mail</a>.
      </Text>
    </MailLayout>
  );
}
