import { postcodeValidator } from "postcode-validator";

// Postal addresses of set owners: the countries the shop ships to, how each writes its postal code, and the
// order of the lines on a label. Postal code patterns come from the postcode-validator package; the spacing
// and the line order are the postal operators' own (named beside their tests).

export type CountryCode =
  | "US"
  | "CA"
  | "GB"
  | "AT"
  | "BE"
  | "BG"
  | "HR"
  | "CY"
  | "CZ"
  | "DK"
  | "EE"
  | "FI"
  | "FR"
  | "DE"
  | "GR"
  | "HU"
  | "IE"
  | "IT"
  | "LV"
  | "LT"
  | "LU"
  | "MT"
  | "NL"
  | "PL"
  | "PT"
  | "RO"
  | "SK"
  | "SI"
  | "ES"
  | "SE";

type Layout = "us" | "ca" | "gb" | "code-city" | "city-code";

type CountryRule = {
  name: string;
  layout: Layout;
  /** What the form calls the postal code. */
  postalLabel: string;
  /** What is allowed, as the error and the hint say it. */
  postalHint: string;
  postalRequired: boolean;
  /** Put in the country's usual spacing before storing (the pattern accepts it with or without). */
  normalise?: (code: string) => string;
};

const squeeze = (c: string) => c.replace(/[\s-]+/g, "");
const spaceBeforeLast = (n: number) => (c: string) => {
  const s = squeeze(c);
  return `${s.slice(0, s.length - n)} ${s.slice(s.length - n)}`;
};
const digits = (n: number, example: string): Pick<CountryRule, "postalHint" | "postalRequired"> => ({
  postalHint: `${n} digits, for example ${example}`,
  postalRequired: true,
});

export const COUNTRIES: Record<CountryCode, CountryRule> = {
  US: {
    name: "United States",
    layout: "us",
    postalLabel: "ZIP code",
    postalHint: "5 digits or ZIP+4, for example 12345 or 12345-6789",
    postalRequired: true,
  },
  CA: {
    name: "Canada",
    layout: "ca",
    postalLabel: "Postal code",
    postalHint: "letter, digit, letter, space, digit, letter, digit, for example K1A 0B1",
    postalRequired: true,
    normalise: spaceBeforeLast(3),
  },
  GB: {
    name: "United Kingdom",
    layout: "gb",
    postalLabel: "Postcode",
    postalHint: "a UK postcode, for example SW1A 1AA",
    postalRequired: true,
    normalise: spaceBeforeLast(3),
  },
  AT: { name: "Austria", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1010") },
  BE: { name: "Belgium", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1000") },
  BG: { name: "Bulgaria", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1000") },
  HR: { name: "Croatia", layout: "code-city", postalLabel: "Postal code", ...digits(5, "10000") },
  CY: { name: "Cyprus", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1010") },
  CZ: {
    name: "Czechia",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "5 digits written 3 + 2, for example 110 00",
    postalRequired: true,
    normalise: spaceBeforeLast(2),
  },
  DK: { name: "Denmark", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1050") },
  EE: { name: "Estonia", layout: "code-city", postalLabel: "Postal code", ...digits(5, "10111") },
  FI: { name: "Finland", layout: "code-city", postalLabel: "Postal code", ...digits(5, "00100") },
  FR: { name: "France", layout: "code-city", postalLabel: "Postal code", ...digits(5, "75008") },
  DE: { name: "Germany", layout: "code-city", postalLabel: "Postal code", ...digits(5, "10115") },
  GR: {
    name: "Greece",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "5 digits written 3 + 2, for example 105 57",
    postalRequired: true,
    normalise: spaceBeforeLast(2),
  },
  HU: { name: "Hungary", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1051") },
  IE: {
    name: "Ireland",
    layout: "city-code",
    postalLabel: "Eircode",
    postalHint: "an Eircode such as D02 X285, or leave it empty",
    postalRequired: false,
    normalise: spaceBeforeLast(4),
  },
  IT: { name: "Italy", layout: "code-city", postalLabel: "Postal code (CAP)", ...digits(5, "00184") },
  LV: {
    name: "Latvia",
    layout: "city-code",
    postalLabel: "Postal code",
    postalHint: "LV- and 4 digits, for example LV-1050",
    postalRequired: true,
  },
  LT: {
    name: "Lithuania",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "LT- and 5 digits, for example LT-01100",
    postalRequired: true,
  },
  LU: { name: "Luxembourg", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1009") },
  MT: {
    name: "Malta",
    layout: "city-code",
    postalLabel: "Postcode",
    postalHint: "3 letters and 4 digits, for example VLT 1117",
    postalRequired: true,
    normalise: spaceBeforeLast(4),
  },
  NL: {
    name: "Netherlands",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "4 digits and 2 letters, for example 1012 AB",
    postalRequired: true,
    normalise: spaceBeforeLast(2),
  },
  PL: {
    name: "Poland",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "2 digits, a hyphen, 3 digits, for example 00-950",
    postalRequired: true,
  },
  PT: {
    name: "Portugal",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "4 digits, a hyphen, 3 digits, for example 1000-001",
    postalRequired: true,
  },
  RO: { name: "Romania", layout: "code-city", postalLabel: "Postal code", ...digits(6, "010011") },
  SK: {
    name: "Slovakia",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "5 digits written 3 + 2, for example 811 01",
    postalRequired: true,
    normalise: spaceBeforeLast(2),
  },
  SI: { name: "Slovenia", layout: "code-city", postalLabel: "Postal code", ...digits(4, "1000") },
  ES: { name: "Spain", layout: "code-city", postalLabel: "Postal code", ...digits(5, "28013") },
  SE: {
    name: "Sweden",
    layout: "code-city",
    postalLabel: "Postal code",
    postalHint: "5 digits written 3 + 2, for example 114 55",
    postalRequired: true,
    normalise: spaceBeforeLast(2),
  },
};

export const COUNTRY_CODES = Object.keys(COUNTRIES) as CountryCode[];

export function isCountryCode(code: string): code is CountryCode {
  return Object.hasOwn(COUNTRIES, code);
}

// USPS two-letter abbreviations: the states, the District of Columbia and the territories it delivers to.
export const US_STATES: readonly (readonly [string, string])[] = [
  ["AL", "Alabama"],
  ["AK", "Alaska"],
  ["AZ", "Arizona"],
  ["AR", "Arkansas"],
  ["CA", "California"],
  ["CO", "Colorado"],
  ["CT", "Connecticut"],
  ["DE", "Delaware"],
  ["DC", "District of Columbia"],
  ["FL", "Florida"],
  ["GA", "Georgia"],
  ["HI", "Hawaii"],
  ["ID", "Idaho"],
  ["IL", "Illinois"],
  ["IN", "Indiana"],
  ["IA", "Iowa"],
  ["KS", "Kansas"],
  ["KY", "Kentucky"],
  ["LA", "Louisiana"],
  ["ME", "Maine"],
  ["MD", "Maryland"],
  ["MA", "Massachusetts"],
  ["MI", "Michigan"],
  ["MN", "Minnesota"],
  ["MS", "Mississippi"],
  ["MO", "Missouri"],
  ["MT", "Montana"],
  ["NE", "Nebraska"],
  ["NV", "Nevada"],
  ["NH", "New Hampshire"],
  ["NJ", "New Jersey"],
  ["NM", "New Mexico"],
  ["NY", "New York"],
  ["NC", "North Carolina"],
  ["ND", "North Dakota"],
  ["OH", "Ohio"],
  ["OK", "Oklahoma"],
  ["OR", "Oregon"],
  ["PA", "Pennsylvania"],
  ["RI", "Rhode Island"],
  ["SC", "South Carolina"],
  ["SD", "South Dakota"],
  ["TN", "Tennessee"],
  ["TX", "Texas"],
  ["UT", "Utah"],
  ["VT", "Vermont"],
  ["VA", "Virginia"],
  ["WA", "Washington"],
  ["WV", "West Virginia"],
  ["WI", "Wisconsin"],
  ["WY", "Wyoming"],
  ["AS", "American Samoa"],
  ["GU", "Guam"],
  ["MP", "Northern Mariana Islands"],
  ["PR", "Puerto Rico"],
  ["VI", "U.S. Virgin Islands"],
];

// Canada Post's two-letter abbreviations of the provinces and territories.
export const CA_PROVINCES: readonly (readonly [string, string])[] = [
  ["AB", "Alberta"],
  ["BC", "British Columbia"],
  ["MB", "Manitoba"],
  ["NB", "New Brunswick"],
  ["NL", "Newfoundland and Labrador"],
  ["NS", "Nova Scotia"],
  ["NT", "Northwest Territories"],
  ["NU", "Nunavut"],
  ["ON", "Ontario"],
  ["PE", "Prince Edward Island"],
  ["QC", "Quebec"],
  ["SK", "Saskatchewan"],
  ["YT", "Yukon"],
];

/** The region list a country's form offers, or null when the country has none on its labels. */
export function regionsOf(country: CountryCode): readonly (readonly [string, string])[] | null {
  return country === "US" ? US_STATES : country === "CA" ? CA_PROVINCES : null;
}

export function regionLabel(country: CountryCode): string {
  return country === "US" ? "State" : country === "CA" ? "Province or territory" : country === "GB" ? "County" : "Region or province";
}

export function cityLabel(country: CountryCode): string {
  return country === "GB" ? "Town or city" : "City";
}

export type PostalAddress = {
  /** Who the parcel is for. */
  recipient: string;
  line1: string;
  line2?: string | null;
  city: string;
  /** US state or Canadian province abbreviation; optional elsewhere (a county, an Italian province). */
  region?: string | null;
  postalCode?: string | null;
  country: CountryCode;
};

export type AddressField = "recipient" | "line1" | "line2" | "city" | "region" | "postalCode" | "country";

/**
 * Checks the country-dependent parts of an address (region and postal code) and returns it with the postal
 * code in its country's spelling. Errors are keyed by field, each message starting with the field's label.
 */
export function checkPostalAddress(
  a: PostalAddress,
): { ok: true; address: PostalAddress } | { ok: false; errors: Partial<Record<AddressField, string>> } {
  const errors: Partial<Record<AddressField, string>> = {};
  if (!isCountryCode(a.country)) {
    return { ok: false, errors: { country: "Country: choose one from the list." } };
  }
  const rule = COUNTRIES[a.country];
  const regions = regionsOf(a.country);
  const region = (a.region ?? "").trim();
  let regionOut: string | null = region || null;
  if (regions) {
    const hit = regions.find(([code, name]) => code === region.toUpperCase() || name.toLowerCase() === region.toLowerCase());
    if (!hit) errors.region = `${regionLabel(a.country)}: choose one from the list.`;
    else regionOut = hit[0];
  }
  const raw = (a.postalCode ?? "").trim().toUpperCase();
  let postalOut: string | null = null;
  if (!raw) {
    if (rule.postalRequired) errors.postalCode = `${rule.postalLabel}: enter ${rule.postalHint}.`;
  } else if (!postcodeValidator(raw, a.country)) {
    errors.postalCode = `${rule.postalLabel}: enter ${rule.postalHint}.`;
  } else {
    postalOut = rule.normalise ? rule.normalise(raw) : raw;
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  return {
    ok: true,
    address: {
      recipient: a.recipient.trim(),
      line1: a.line1.trim(),
      line2: a.line2?.trim() || null,
      city: a.city.trim(),
      region: regionOut,
      postalCode: postalOut,
      country: a.country,
    },
  };
}

/**
 * The address as the lines of a label or a printed document, in the destination country's order. The country
 * name closes the address in capitals, as international mail asks; pass `domestic` (the sender's country) to
 * leave it off mail that stays in that country.
 */
export function formatPostalAddress(address: PostalAddress, options: { domestic?: CountryCode } = {}): string[] {
  const rule = isCountryCode(address.country) ? COUNTRIES[address.country] : null;
  const lines = [address.recipient, address.line1, address.line2 ?? ""].map((l) => l.trim()).filter(Boolean);
  const city = address.city.trim();
  const region = (address.region ?? "").trim();
  const code = (address.postalCode ?? "").trim();
  const join = (...parts: string[]) => parts.filter(Boolean).join(" ");
  switch (rule?.layout) {
    case "us":
      lines.push(`${join(city.toUpperCase() + ",", region)}${code ? ` ${code}` : ""}`.replace(/,$/, ""));
      break;
    case "ca":
      // Canada Post: municipality, province and postal code on one line, two spaces before the code.
      lines.push(`${join(city.toUpperCase(), region)}${code ? `  ${code}` : ""}`);
      break;
    case "gb":
      lines.push(city.toUpperCase());
      if (region) lines.push(region);
      if (code) lines.push(code);
      break;
    case "city-code":
      lines.push(join(city, address.country === "LV" ? "" : region));
      if (address.country === "LV") lines[lines.length - 1] = [city, code].filter(Boolean).join(", ");
      else if (code) lines.push(code);
      break;
    default:
      lines.push(join(code, city));
      if (region) lines.push(region);
  }
  if (address.country !== options.domestic) lines.push((rule?.name ?? address.country).toUpperCase());
  return lines.filter(Boolean);
}
