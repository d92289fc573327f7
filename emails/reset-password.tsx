import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type ResetPasswordProps = { name: string; url: string };

export default function ResetPassword({
  name = "Mira",
  url = "http://127.0.0.1:3000/reset-password?token=example",
}: Partial<ResetPasswordProps>) {
  return (
    <MailLayout preview="Choose a new password">
      <Heading style={mailStyles.h1}>Choose a new password</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, someone asked to reset the password of your account. Use the button to choose a new one.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Choose a new password
      </Button>
      <Text style={mailStyles.small}>
        If this was not you, ignore this message; your password stays as it is. The link expires in one hour.
      </Text>
    </MailLayout>
  );
}
