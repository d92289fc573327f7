import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type ShopMessageProps = {
  name: string;
  jobNumber: string;
  setName: string;
  from: string;
  message: string;
  photoCount: number;
  url: string;
};

export default function ShopMessage({
  name = "Mira",
  jobNumber = "KL-0042",
  setName = "Aurelian 5T-48",
  from = "Tomas",
  message = "The dial cord was replaced today; the pointer now reaches both ends of the scale.",
  photoCount = 0,
  url = "http://127.0.0.1:3000/portal/jobs/example",
}: Partial<ShopMessageProps>) {
  return (
    <MailLayout preview={`A message about your ${setName}`}>
      <Heading style={mailStyles.h1}>A message from the shop</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, {from} at the shop wrote about your {setName} ({jobNumber}):
      </Text>
      <Text style={{ ...mailStyles.p, borderLeft: "3px solid #d9cdb8", paddingLeft: 12, whiteSpace: "pre-line" }}>{message}</Text>
      {photoCount > 0 ? (
        <Text style={mailStyles.small}>
          {photoCount === 1 ? "One photo comes" : `${photoCount} photos come`} with this message; see them on your job page.
        </Text>
      ) : null}
      <Button href={url} style={mailStyles.button}>
        Open the message thread
      </Button>
      <Text style={mailStyles.small}>You can answer on your job page, with photos if they help.</Text>
    </MailLayout>
  );
}
