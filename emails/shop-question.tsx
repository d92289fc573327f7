import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type ShopQuestionProps = { name: string; jobNumber: string; setName: string; question: string; url: string };

export default function ShopQuestion({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  question = "Is there a paper label inside the back cover with a chassis number?",
  url = "http://127.0.0.1:3000/portal/jobs/example",
}: Partial<ShopQuestionProps>) {
  return (
    <MailLayout preview={`A question about your ${setName}`}>
      <Heading style={mailStyles.h1}>The shop has a question</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, before we can finish the estimate for your {setName} ({jobNumber}), the technician would like to know:
      </Text>
      <Text style={{ ...mailStyles.p, borderLeft: "3px solid #d9cdb8", paddingLeft: 12, fontStyle: "italic" }}>{question}</Text>
      <Button href={url} style={mailStyles.button}>
        Answer the question
      </Button>
      <Text style={mailStyles.small}>You can answer in the message thread on your job page; photos help too.</Text>
    </MailLayout>
  );
}
