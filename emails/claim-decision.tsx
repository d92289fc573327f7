import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type ClaimDecisionProps = {
  name: string;
  maker: string;
  model: string;
  decision: "accepted" | "rejected" | "inspecting";
  reason: string;
  claimUrl: string;
  shopAddress: string;
};

const HEADINGS: Record<ClaimDecisionProps["decision"], string> = {
  accepted: "We accepted your warranty claim",
  rejected: "We cannot cover your warranty claim",
  inspecting: "We would like to inspect your set first",
};

export default function ClaimDecision({
  name = "Mira",
  maker = "Aurelian",
  model = "Model 5T table set",
  decision = "accepted",
  reason = "The hum comes from the filter capacitor we fitted.",
  claimUrl = "http://127.0.0.1:3000/portal/claims/example",
  shopAddress = "Kestrel Lane Wireless, 14 Kestrel Lane, Port Alder",
}: Partial<ClaimDecisionProps>) {
  return (
    <MailLayout preview={HEADINGS[decision]}>
      <Heading style={mailStyles.h1}>{HEADINGS[decision]}</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, about your claim on the {maker} {model}:
      </Text>
      {reason ? <Text style={mailStyles.p}>{reason}</Text> : null}
      {decision === "accepted" ? (
        <Text style={mailStyles.p}>
          We opened a warranty job for it; the covered work is at no charge. Please keep the set unplugged and send or bring it to{" "}
          {shopAddress}.
        </Text>
      ) : null}
      {decision === "inspecting" ? (
        <Text style={mailStyles.p}>
          Please keep the set unplugged and send or bring it to {shopAddress}. We will decide once we have seen it.
        </Text>
      ) : null}
      <Button href={claimUrl} style={mailStyles.button}>
        See the claim
      </Button>
      <Text style={mailStyles.small}>If you disagree with this decision, reply to this message and the shop owner will review it.</Text>
    </MailLayout>
  );
}
