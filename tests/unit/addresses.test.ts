import { describe, expect, it } from "vitest";
import { checkPostalAddress, COUNTRY_CODES, formatPostalAddress, type CountryCode, type PostalAddress } from "@/lib/engine/addresses";
import { addressSchema } from "@/lib/validation/owner-account";

// Postal code formats as each postal operator publishes them. The examples are real, well-known addresses'
// codes; every source below is from memory of the operator's published addressing guide.
const base = { recipient: "Mira Holloway", line1: "14 Kestrel Lane", city: "Port Alder" };
const at = (country: CountryCode, postalCode: string, region = "") => checkPostalAddress({ ...base, country, postalCode, region });

describe("postal codes per country", () => {
  it("US: ZIP is 5 digits or ZIP+4 (USPS Publication 28, from memory)", () => {
    expect(at("US", "20500", "DC").ok).toBe(true);
    expect(at("US", "20500-0003", "DC").ok).toBe(true);
    const bad = at("US", "2050", "DC");
    expect(bad.ok || bad.errors.postalCode).toMatch(/^ZIP code: /);
    expect(at("US", "205000", "DC").ok).toBe(false);
  });

  it("US: the state is one of USPS's two-letter codes, by code or by name (USPS Publication 28, from memory)", () => {
    const byName = at("US", "20500", "District of Columbia");
    expect(byName.ok && byName.address.region).toBe("DC");
    const none = at("US", "20500", "");
    expect(none.ok || none.errors.region).toMatch(/^State: /);
    expect(at("US", "20500", "ZZ").ok).toBe(false);
  });

  it("Canada: A1A 1A1, stored with the space; D, F, I, O, Q, U never appear (Canada Post addressing guidelines, from memory)", () => {
    const ok = at("CA", "k1a0b1", "ON");
    expect(ok.ok && ok.address.postalCode).toBe("K1A 0B1");
    expect(at("CA", "D1A 0B1", "ON").ok).toBe(false);
    expect(at("CA", "K1A 0B", "ON").ok).toBe(false);
    const noProvince = at("CA", "K1A 0B1", "");
    expect(noProvince.ok || noProvince.errors.region).toMatch(/^Province or territory: /);
  });

  it("UK: outward and inward code, one space before the last three characters (Royal Mail PAF guide, from memory)", () => {
    const ok = at("GB", "sw1a1aa");
    expect(ok.ok && ok.address.postalCode).toBe("SW1A 1AA");
    expect(at("GB", "EC1A 1BB").ok).toBe(true);
    expect(at("GB", "M1 1AE").ok).toBe(true);
    const bad = at("GB", "SW1A");
    expect(bad.ok || bad.errors.postalCode).toMatch(/^Postcode: /);
  });

  it("EU: DE, FR, IT, ES 5 digits; BE, AT, DK 4 digits (Deutsche Post, La Poste, Poste Italiane, Correos, bpost, Post AG, PostNord; from memory)", () => {
    for (const [c, good, bad] of [
      ["DE", "10115", "1011"],
      ["FR", "75008", "7500"],
      ["IT", "00184", "0018"],
      ["ES", "28013", "2801"],
      ["BE", "1000", "10000"],
      ["AT", "1010", "10100"],
      ["DK", "1050", "10500"],
    ] as const) {
      expect(at(c, good).ok, `${c} ${good}`).toBe(true);
      const r = at(c, bad);
      expect(r.ok, `${c} ${bad}`).toBe(false);
      if (!r.ok) expect(r.errors.postalCode).toMatch(/^Postal code/);
    }
  });

  it("Netherlands: 4 digits and 2 letters, written 1234 AB (PostNL, from memory)", () => {
    const ok = at("NL", "1012ab");
    expect(ok.ok && ok.address.postalCode).toBe("1012 AB");
    expect(at("NL", "1012").ok).toBe(false);
  });

  it("Ireland: the Eircode is optional, and when given has a routing key and a unique identifier (Eircode, from memory)", () => {
    expect(at("IE", "").ok).toBe(true);
    const ok = at("IE", "d02x285");
    expect(ok.ok && ok.address.postalCode).toBe("D02 X285");
    expect(at("IE", "D02").ok).toBe(false);
  });

  it("every country in the list has a postal code rule (the package knows it)", () => {
    for (const c of COUNTRY_CODES) expect(at(c, "not a code!").ok, c).toBe(false);
  });

  it("the form schema names the field in each error", () => {
    const r = addressSchema.safeParse({ ...base, country: "US", region: "NY", postalCode: "1" });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({
      path: ["postalCode"],
      message: expect.stringMatching(/^ZIP code: enter 5 digits or ZIP\+4/),
    });
  });
});

describe("formatPostalAddress: the lines of a label in the country's order", () => {
  const a = (country: CountryCode, rest: Partial<PostalAddress>): PostalAddress => ({ ...base, country, ...rest });

  it("US: CITY, ST ZIP on the last line before the country (USPS Publication 28, from memory)", () => {
    expect(formatPostalAddress(a("US", { region: "NY", postalCode: "10001-0001", city: "New York" }))).toEqual([
      "Mira Holloway",
      "14 Kestrel Lane",
      "NEW YORK, NY 10001-0001",
      "UNITED STATES",
    ]);
    expect(formatPostalAddress(a("US", { region: "NY", postalCode: "10001" }), { domestic: "US" }).at(-1)).toBe("PORT ALDER, NY 10001");
  });

  it("Canada: municipality, province, two spaces, postal code (Canada Post addressing guidelines, from memory)", () => {
    expect(formatPostalAddress(a("CA", { city: "Ottawa", region: "ON", postalCode: "K1A 0B1" }))).toEqual([
      "Mira Holloway",
      "14 Kestrel Lane",
      "OTTAWA ON  K1A 0B1",
      "CANADA",
    ]);
  });

  it("UK: post town in capitals, postcode on its own line (Royal Mail, from memory)", () => {
    expect(formatPostalAddress(a("GB", { city: "London", postalCode: "SW1A 1AA", line2: "Flat 2" }))).toEqual([
      "Mira Holloway",
      "14 Kestrel Lane",
      "Flat 2",
      "LONDON",
      "SW1A 1AA",
      "UNITED KINGDOM",
    ]);
  });

  it("Germany and the Netherlands: postal code before the town (Deutsche Post, PostNL; from memory)", () => {
    expect(formatPostalAddress(a("DE", { city: "Berlin", postalCode: "10115" })).slice(-2)).toEqual(["10115 Berlin", "GERMANY"]);
    expect(formatPostalAddress(a("NL", { city: "Amsterdam", postalCode: "1012 AB" })).slice(-2)).toEqual([
      "1012 AB Amsterdam",
      "NETHERLANDS",
    ]);
  });

  it("Ireland: town, then the Eircode on its own line (An Post, from memory)", () => {
    expect(formatPostalAddress(a("IE", { city: "Dublin 2", postalCode: "D02 X285" })).slice(-3)).toEqual([
      "Dublin 2",
      "D02 X285",
      "IRELAND",
    ]);
  });
});

describe("the address form's checked values", () => {
  it("pass the same schema again, as the server parses what the form sends", () => {
    const first = addressSchema.parse({ ...base, country: "IE", line2: "", region: "", postalCode: "" });
    expect(first.line2).toBeNull();
    expect(addressSchema.parse(first)).toEqual(first);
  });
});
