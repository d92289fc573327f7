import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type StaffInviteProps = { name: string; url: string; roleLabel: string; invitedBy: string };

export default function StaffInvite({
  name = "Tomas",
  url = "http://127.0.0.1:3000/welcome?token=example",
  roleLabel = "Technician",
  invitedBy = "Odile Marchetti",
}: Partial<StaffInviteProps>) {
  return (
    <MailLayout preview={`You are invited to the workshop as ${roleLabel}`}>
      <Heading style={mailStyles.h1}>Welcome to the workshop</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, {invitedBy} added you to Bandedge as {roleLabel}. Set your password to sign in to the bench.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Set my password
      </Button>
      <Text style={mailStyles.small}>The link works once and expires in seven days; ask the shop owner for a new one if it has.</Text>
    </MailLayout>
  );
}
