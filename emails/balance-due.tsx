import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type BalanceDueProps = {
  name: string;
  jobNumber: string;
  setName: string;
  url: string;
  balanceText: string;
  /** Nothing is left to pay (warranty work, or payments already cover the total). */
  settled?: boolean;
  /** What the shop owes back, when payments exceed the final total. */
  owedBackText?: string;
  /** A remainder below the smallest card payment, which the shop waived. */
  waivedText?: string;
};

export default function BalanceDue({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  url = "http://127.0.0.1:3000/portal/jobs/example",
  balanceText = "$218.68",
  settled = false,
  owedBackText,
  waivedText,
}: Partial<BalanceDueProps>) {
  return (
    <MailLayout preview={`Your ${setName} is finished`}>
      <Heading style={mailStyles.h1}>Your set is finished</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, the work on your {setName} ({jobNumber}) is done and every final check passed. The measurements are on your job page
        and will be printed on the warranty certificate.
      </Text>
      {settled ? (
        <Text style={mailStyles.p}>
          There is nothing left to pay, and we will return the set to you.
          {waivedText ? ` The last ${waivedText} was below the smallest card payment, so we have waived it.` : ""}
          {owedBackText ? ` You paid more than the final total: we owe you ${owedBackText} and will refund it.` : ""}
        </Text>
      ) : (
        <Text style={mailStyles.p}>The balance still to pay is {balanceText}. Once it is paid we will return the set to you.</Text>
      )}
      <Button href={url} style={mailStyles.button}>
        {settled ? "See your job" : "Pay the balance"}
      </Button>
    </MailLayout>
  );
}
