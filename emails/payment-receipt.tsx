import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type PaymentReceiptProps = {
  name: string;
  jobNumber: string;
  setName: string;
  url: string;
  amountText: string;
  paidAt: string;
  reference: string;
};

function Receipt({
  kind,
  name,
  jobNumber,
  setName,
  url,
  amountText,
  paidAt,
  reference,
}: PaymentReceiptProps & { kind: "deposit" | "balance" }) {
  const title = kind === "deposit" ? "Deposit received" : "Payment received in full";
  return (
    <MailLayout preview={`${title}: ${amountText} for ${jobNumber}`}>
      <Heading style={mailStyles.h1}>{title}</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, thank you. We received {amountText} for your {setName} ({jobNumber}) on {paidAt}.
      </Text>
      <Text style={mailStyles.p}>
        {kind === "deposit"
          ? "The work can now be scheduled. If you are sending the set by mail, remove any batteries, wrap the chassis and dial glass well, and keep the tracking number."
          : "We will now prepare the set for its return and tell you when it is shipped or ready to pick up."}
      </Text>
      <Text style={mailStyles.small}>Payment reference: {reference}. Keep this e-mail as your receipt.</Text>
      <Button href={url} style={mailStyles.button}>
        See my job
      </Button>
    </MailLayout>
  );
}

const defaults: PaymentReceiptProps = {
  name: "Mira",
  jobNumber: "KL-0042",
  setName: "Aurelian 5T-48",
  url: "http://127.0.0.1:3000/portal/jobs/example",
  amountText: "$93.72",
  paidAt: "12 March 2026",
  reference: "pi_example",
};

export function DepositReceipt(props: Partial<PaymentReceiptProps>) {
  return <Receipt kind="deposit" {...defaults} {...props} />;
}

export function BalanceReceipt(props: Partial<PaymentReceiptProps>) {
  return <Receipt kind="balance" {...defaults} amountText="$218.68" {...props} />;
}

export default DepositReceipt;
