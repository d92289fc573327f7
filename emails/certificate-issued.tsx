import { Button, Heading, Link, Text } from "@react-email/components";
import { formatDay } from "@/lib/engine/dates";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type CertificateIssuedProps = {
  name: string;
  maker: string;
  model: string;
  code: string;
  designation: "limited" | "full";
  termDays: number;
  endsOn: string;
  corrected: boolean;
  /** How the set went back: a shipped set is with the carrier, not yet with its owner. */
  returnMethod: "pick-up" | "shipped" | null;
  verifyUrl: string;
  jobUrl: string;
  pdfUrl: string;
};

export default function CertificateIssued({
  name = "Mira",
  maker = "Aurelian",
  model = "Model 5T table set",
  code = "7K2M-QX4R-9TDE-3HWP-A8NC-5VJB-2GFS",
  designation = "limited",
  termDays = 90,
  endsOn = "2026-05-29",
  corrected = false,
  returnMethod = "pick-up",
  verifyUrl = "http://127.0.0.1:3000/verify/7K2M-QX4R-9TDE-3HWP-A8NC-5VJB-2GFS",
  jobUrl = "http://127.0.0.1:3000/portal/jobs/example",
  pdfUrl = "http://127.0.0.1:3000/api/certificates/example/pdf",
}: Partial<CertificateIssuedProps>) {
  const kind = designation === "full" ? "Full" : "Limited";
  const where =
    returnMethod === "shipped"
      ? `your ${maker} ${model} is on its way back to you with the carrier.`
      : returnMethod === "pick-up"
        ? `your ${maker} ${model} is back with you.`
        : `here is the warranty certificate for your ${maker} ${model}.`;
  return (
    <MailLayout preview={`Your warranty certificate for the ${maker} ${model}`}>
      <Heading style={mailStyles.h1}>{corrected ? "Your corrected warranty certificate" : "Your warranty certificate"}</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, {where}{" "}
        {corrected
          ? "We corrected its certificate: this one replaces the earlier one, which now says it has been superseded."
          : "Its certificate lists the work we did, the parts we fitted and the band edges we measured."}
      </Text>
      <Text style={mailStyles.p}>
        {kind} warranty, {termDays} days, until {formatDay(endsOn)}. Certificate code: <strong>{code}</strong>
      </Text>
      <Button href={pdfUrl} style={mailStyles.button}>
        Download the certificate (PDF)
      </Button>
      <Text style={mailStyles.p}>
        The PDF is also on <Link href={jobUrl}>your job page</Link>. Anyone you show the code to, such as a buyer, can check it at{" "}
        <Link href={verifyUrl}>{verifyUrl}</Link>.
      </Text>
      <Text style={mailStyles.small}>
        If the set develops a fault, unplug it and open a warranty claim from your portal before sending it back.
      </Text>
    </MailLayout>
  );
}
