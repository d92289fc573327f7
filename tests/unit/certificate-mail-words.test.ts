import { describe, expect, test } from "vitest";
import { renderEmail } from "@/emails";

// Where the set is follows from how it went back (common practice in shipping: a parcel handed to a carrier is
// in transit; delivered is a later event the shop does not see). The certificate e-mail is sent when the
// return is recorded, so a shipped set must not be called "back with you".
const CLAIMS_WITH_OWNER = /back with you|with you now|you have it/i;
const CLAIMS_ON_ITS_WAY = /on its way|with the carrier/i;

const base = {
  name: "Ada",
  maker: "Aurelian",
  model: "Model 5T",
  code: "7K2M-QX4R-9TDE-3HWP-A8NC-5VJB-2GFS",
  designation: "limited",
  termDays: 90,
  endsOn: "2027-03-01",
  corrected: false,
  verifyUrl: "http://127.0.0.1:3000/verify/x",
  jobUrl: "http://127.0.0.1:3000/portal/jobs/x",
  pdfUrl: "http://127.0.0.1:3000/api/certificates/x/pdf",
};

describe("the certificate e-mail says where the set is", () => {
  test("shipped: on its way with the carrier, never back with the owner", async () => {
    const { text } = await renderEmail("certificate-issued", { ...base, returnMethod: "shipped" });
    expect(text).toMatch(CLAIMS_ON_ITS_WAY);
    expect(text).not.toMatch(CLAIMS_WITH_OWNER);
  });

  test("collected at the counter: back with the owner", async () => {
    const { text } = await renderEmail("certificate-issued", { ...base, returnMethod: "pick-up" });
    expect(text).toMatch(CLAIMS_WITH_OWNER);
    expect(text).not.toMatch(CLAIMS_ON_ITS_WAY);
  });

  test("a reissued certificate whose return is not known claims neither", async () => {
    const { text } = await renderEmail("certificate-issued", { ...base, corrected: true, returnMethod: null });
    expect(text).not.toMatch(CLAIMS_WITH_OWNER);
    expect(text).not.toMatch(CLAIMS_ON_ITS_WAY);
  });
});
