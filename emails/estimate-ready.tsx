import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type EstimateReadyProps = {
  name: string;
  jobNumber: string;
  setName: string;
  url: string;
  totalText: string;
  depositText: string;
  changeSummary?: string;
  /** A change asked while the set is on the bench: no deposit, the difference goes into the balance. */
  atBench?: boolean;
};

export default function EstimateReady({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  url = "http://127.0.0.1:3000/portal/jobs/example",
  totalText = "$312.40",
  depositText = "$93.72",
}: Partial<EstimateReadyProps>) {
  return (
    <MailLayout preview={`Your estimate for ${setName} is ready`}>
      <Heading style={mailStyles.h1}>Your estimate is ready</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, the technician has written the estimate for your {setName} ({jobNumber}). It lists every step of the work with the
        reason for it, the parts, the tax and what the warranty will cover.
      </Text>
      <Text style={mailStyles.p}>
        Total: {totalText}. Deposit to start the work: {depositText}.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Read and decide
      </Button>
      <Text style={mailStyles.small}>Nothing is charged until you approve the estimate and pay the deposit.</Text>
    </MailLayout>
  );
}
