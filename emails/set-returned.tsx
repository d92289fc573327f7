import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type SetReturnedProps = {
  name: string;
  jobNumber: string;
  setName: string;
  method: "pick-up" | "shipped";
  carrier?: string;
  trackingNumber?: string;
  url: string;
};

export default function SetReturned({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  method = "shipped",
  carrier = "Port Alder Parcel",
  trackingNumber = "PA123456789",
  url = "http://127.0.0.1:3000/portal/jobs/example",
}: Partial<SetReturnedProps>) {
  const shipped = method === "shipped";
  return (
    <MailLayout preview={shipped ? `Your ${setName} is on its way` : `Your ${setName} is ready for pick-up`}>
      <Heading style={mailStyles.h1}>{shipped ? "Your set is on its way" : "Your set is ready for pick-up"}</Heading>
      <Text style={mailStyles.p}>
        Hello {name},{" "}
        {shipped
          ? `your ${setName} (${jobNumber}) has been shipped${carrier ? ` with ${carrier}` : ""}.`
          : `your ${setName} (${jobNumber}) is ready at the shop. Please bring this e-mail or your job number.`}
      </Text>
      {shipped && trackingNumber ? <Text style={mailStyles.p}>Tracking number: {trackingNumber}</Text> : null}
      <Text style={mailStyles.p}>
        Your warranty certificate is on your job page. When unpacking, let the set reach room temperature before switching it on.
      </Text>
      <Button href={url} style={mailStyles.button}>
        See my job and certificate
      </Button>
    </MailLayout>
  );
}
