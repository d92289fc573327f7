import { Button, Heading, Text } from "@react-email/components";
import { MailLayout, mailStyles } from "./components/mail-layout";

export type OwnerInviteProps = { name: string; url: string; jobNumber: string; setName: string; shopName: string };

// A customer taken in at the counter or on the phone, invited to follow the job in the portal.
export default function OwnerInvite({
  name = "Hollis",
  url = "http://127.0.0.1:3000/welcome?token=example",
  jobNumber = "KL-0012",
  setName = "Haldane Coronet",
  shopName = "Kestrel Lane Wireless",
}: Partial<OwnerInviteProps>) {
  return (
    <MailLayout preview={`Follow your ${setName} (${jobNumber}) online`}>
      <Heading style={mailStyles.h1}>Your set is with {shopName}</Heading>
      <Text style={mailStyles.p}>
        Hello {name}, we have taken in your {setName} as job {jobNumber}. Set a password to follow the job online: read the estimate,
        approve it, pay and message the workshop.
      </Text>
      <Button href={url} style={mailStyles.button}>
        Set my password
      </Button>
      <Text style={mailStyles.small}>
        The link works once and expires in seven days. You do not need an account: the shop can also take your answers by phone or at the
        counter.
      </Text>
    </MailLayout>
  );
}
