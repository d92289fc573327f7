"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation } from "@tanstack/react-query";
import { useForm, useWatch } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { cityLabel, COUNTRIES, COUNTRY_CODES, regionLabel, regionsOf, type CountryCode } from "@/lib/engine/addresses";
import { addressSchema, type AddressInput, type AddressValues } from "@/lib/validation/owner-account";
import type { OwnerAddress } from "@/lib/server/services/owner-account";
import { api, ApiError } from "../../_lib/api";

const FIELDS = ["recipient", "line1", "line2", "city", "region", "postalCode", "country"] as const;

// Countries in the list by name; the first three are the ones the shop ships to most.
const COUNTRY_OPTIONS: CountryCode[] = [
  "US",
  "CA",
  "GB",
  ...COUNTRY_CODES.filter((c) => !["US", "CA", "GB"].includes(c)).sort((a, b) => COUNTRIES[a].name.localeCompare(COUNTRIES[b].name)),
];

/** Adds an address, or edits one (`address`). The region and postal code follow the chosen country. */
export function AddressForm({
  address,
  defaultName,
  onSaved,
  onCancel,
}: {
  address?: OwnerAddress;
  defaultName: string;
  onSaved: () => void;
  onCancel?: () => void;
}) {
  const idp = address ? `addr-${address.id.slice(0, 8)}` : "addr-new";
  const form = useForm<AddressInput, unknown, AddressValues>({
    resolver: zodResolver(addressSchema),
    defaultValues: {
      recipient: address?.recipient ?? defaultName,
      line1: address?.line1 ?? "",
      line2: address?.line2 ?? "",
      city: address?.city ?? "",
      region: address?.region ?? "",
      postalCode: address?.postalCode ?? "",
      country: address?.country ?? "US",
      isDefault: address?.isDefault ?? false,
    },
  });
  const country = (useWatch({ control: form.control, name: "country" }) ?? "US") as CountryCode;
  const rule = COUNTRIES[country] ?? COUNTRIES.US;
  const regions = regionsOf(country);
  const save = useMutation({
    mutationFn: (body: AddressValues) =>
      address
        ? api(`/api/portal/account/addresses/${address.id}`, { method: "PATCH", body })
        : api("/api/portal/account/addresses", { method: "POST", body }),
    onSuccess: () => {
      if (!address) form.reset();
      onSaved();
    },
    onError: (e) => {
      if (e instanceof ApiError) for (const k of FIELDS) if (e.fields[k]) form.setError(k, { message: e.fields[k] });
    },
  });
  const errs = form.formState.errors;
  const input = (name: (typeof FIELDS)[number], autoComplete: string) => ({
    id: `${idp}-${name}`,
    className: "field-input",
    autoComplete,
    "aria-invalid": errs[name] ? true : undefined,
    "aria-describedby": describedBy(`${idp}-${name}`, { error: errs[name] }),
    ...form.register(name),
  });
  return (
    <form
      noValidate
      className="space-y-3"
      onSubmit={form.handleSubmit((v) => save.mutate(v))}
      aria-label={address ? "Edit address" : "New address"}
    >
      <Field id={`${idp}-country`} label="Country" error={errs.country?.message}>
        <select {...input("country", "country")}>
          {COUNTRY_OPTIONS.map((c) => (
            <option key={c} value={c}>
              {COUNTRIES[c].name}
            </option>
          ))}
        </select>
      </Field>
      <Field id={`${idp}-recipient`} label="Name on the parcel" error={errs.recipient?.message}>
        <input {...input("recipient", "name")} />
      </Field>
      <Field id={`${idp}-line1`} label="Street and number" error={errs.line1?.message}>
        <input {...input("line1", "address-line1")} />
      </Field>
      <Field id={`${idp}-line2`} label="Flat, floor, building (optional)" error={errs.line2?.message}>
        <input {...input("line2", "address-line2")} />
      </Field>
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id={`${idp}-city`} label={cityLabel(country)} error={errs.city?.message}>
          <input {...input("city", "address-level2")} />
        </Field>
        <Field
          id={`${idp}-region`}
          label={regions ? regionLabel(country) : `${regionLabel(country)} (optional)`}
          error={errs.region?.message}
        >
          {regions ? (
            <select {...input("region", "address-level1")}>
              <option value="">Choose…</option>
              {regions.map(([code, name]) => (
                <option key={code} value={code}>
                  {name}
                </option>
              ))}
            </select>
          ) : (
            <input {...input("region", "address-level1")} />
          )}
        </Field>
        <Field
          id={`${idp}-postalCode`}
          label={rule.postalRequired ? rule.postalLabel : `${rule.postalLabel} (optional)`}
          hint={rule.postalHint.replace(/^./, (c) => c.toUpperCase())}
          error={errs.postalCode?.message}
        >
          <input {...input("postalCode", "postal-code")} />
        </Field>
      </div>
      <label className="inline-flex items-center gap-2">
        <input type="checkbox" {...form.register("isDefault")} disabled={address?.isDefault} /> Use as my default address
      </label>
      {save.isError && !(save.error instanceof ApiError && Object.keys(save.error.fields).length > 0) ? (
        <Notice tone="error" live>
          <p>{save.error.message}</p>
        </Notice>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          {save.isPending ? "Saving…" : address ? "Save address" : "Add address"}
        </button>
        {onCancel ? (
          <button type="button" className="btn-secondary" onClick={onCancel}>
            Cancel
          </button>
        ) : null}
      </div>
    </form>
  );
}
