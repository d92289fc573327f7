import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type VerifyEmailProps = { name: string; url: string };

export default function VerifyEmail({
  name = "Mira",
  url = "http://127.0.0.1:3000/api/auth/verify-email?token=example",
}: Partial<VerifyEmailProps>) {
  return (
    <MailLayout preview="Confirm your e-mail address">
      <Heading style={mailStyles.h1}>Confirm your e-mail address</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, please confirm this address so the shop can send you estimates and updates about your set.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Confirm my address
      </Button>
      <Text style={mailStyles.small}>If you did not create an account, you can ignore this message. The link expires in one hour.</Text>
    </MailLayout>
  );
}
