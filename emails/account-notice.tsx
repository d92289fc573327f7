import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

// A short notice that something irreversible was done to the reader's account, payment or certificate.
export type AccountNoticeProps = { name: string; subject: string; heading: string; paragraphs: string[]; url?: string; linkLabel?: string };

export default function AccountNotice({
  name = "Mira",
  heading = "Your warranty certificate was revoked",
  paragraphs = ["The shop revoked certificate KL-C-0001 for your Aurelian 5T-48. Reason: issued for the wrong set."],
  url,
  linkLabel = "See my job",
}: Partial<AccountNoticeProps>) {
  return (
    <MailLayout preview={heading}>
      <Heading style={mailStyles.h1}>{heading}</Heading>
      <Text style={mailStyles.p}>Hello {name},</Text>
      {paragraphs.map((p, i) => (
        <Text key={i} style={mailStyles.p}>
          {p}
        </Text>
      ))}
      {url ? (
        <Button href={url} style={mailStyles.button}>
          {linkLabel}
        </Button>
      ) : null}
      <Text style={mailStyles.small}>Questions? Reply to this e-mail and it reaches the workshop.</Text>
    </MailLayout>
  );
}
