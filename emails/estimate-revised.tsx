import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";
import type { EstimateReadyProps } from "./estimate-ready";

export type EstimateRevisedProps = EstimateReadyProps;

export default function EstimateRevised({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  url = "http://127.0.0.1:3000/portal/jobs/example",
  totalText = "$348.10",
  depositText = "$104.43",
  changeSummary = "The output transformer has an open primary and must be replaced.",
  atBench = false,
}: Partial<EstimateRevisedProps>) {
  return (
    <MailLayout preview={`A revised estimate for ${setName}`}>
      <Heading style={mailStyles.h1}>We revised your estimate</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, the estimate for your {setName} ({jobNumber}) has changed and needs your approval again before we go on.
        {atBench ? " Your set stays on our bench meanwhile." : ""}
      </Text>
      {changeSummary ? (
        <Text style={{ ...mailStyles.p, borderLeft: "3px solid #d9cdb8", paddingLeft: 12 }}>What changed: {changeSummary}</Text>
      ) : null}
      <Text style={mailStyles.p}>
        {atBench
          ? `New total: ${totalText}. Nothing is asked now: the difference is settled in the balance when the work is done, or refunded if the new total is lower than what you have paid.`
          : `New total: ${totalText}. Deposit: ${depositText}.`}
      </Text>
      <Button href={url} style={mailStyles.button}>
        Read and decide
      </Button>
    </MailLayout>
  );
}
