import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type BalanceDueProps = { name: string; jobNumber: string; setName: string; url: string; balanceText: string };

export default function BalanceDue({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  url = "http://127.0.0.1:3000/portal/jobs/example",
  balanceText = "$218.68",
}: Partial<BalanceDueProps>) {
  return (
    <MailLayout preview={`Your ${setName} is finished`}>
      <Heading style={mailStyles.h1}>Your set is finished</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, the work on your {setName} ({jobNumber}) is done and every final check passed. The measurements are on your job page
        and will be printed on the warranty certificate.
      </Text>
      <Text style={mailStyles.p}>The balance still to pay is {balanceText}. Once it is paid we will return the set to you.</Text>
      <Button href={url} style={mailStyles.button}>
        Pay the balance
      </Button>
    </MailLayout>
  );
}
