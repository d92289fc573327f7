import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type QuoteReceivedProps = { name: string; jobNumber: string; setName: string; url: string; delivery: "drop-off" | "mail-in" };

export default function QuoteReceived({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  url = "http://127.0.0.1:3000/portal/jobs/example",
  delivery = "mail-in",
}: Partial<QuoteReceivedProps>) {
  return (
    <MailLayout preview={`We received your quote request ${jobNumber}`}>
      <Heading style={mailStyles.h1}>We have your quote request</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, thank you for telling us about your {setName}. Your request is number {jobNumber}. A technician will look at your
        description and photos and write an estimate; we will e-mail you when it is ready, or if we have a question.
      </Text>
      <Text style={mailStyles.p}>
        {delivery === "mail-in"
          ? "Please do not ship the set yet: wait until you have approved the estimate. We will tell you how to pack it."
          : "Please wait until you have approved the estimate before bringing the set in."}{" "}
        Until it has been restored, please do not plug it in.
      </Text>
      <Button href={url} style={mailStyles.button}>
        See my request
      </Button>
    </MailLayout>
  );
}
