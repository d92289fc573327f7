"use client";

import { zodResolver } from "@/lib/client/zod-resolver";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import { describedBy, Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { TableScroll } from "@/components/ui/table-scroll";
import type { PartView } from "@/lib/server/services/parts";
import { formatMinor } from "@/lib/engine/pricing/money";
import { moneyText } from "@/lib/validation/estimate";
import { partFormSchema, type PartFormInput, type PartFormValues } from "@/lib/validation/parts";
import { ApiError, officeFetch } from "@/lib/client/office-api";
import { officeKeys } from "@/lib/client/office-query-keys";

type Outcome = { tone: "success" | "error"; text: string } | null;
type Currency = { code: string; exponent: number };
type Show = "active" | "retired" | "all";

const errorText = (e: unknown) => (e instanceof Error ? e.message : "Something went wrong. Please try again.");
const FIELDS = ["name", "supplierRef", "cost", "markupPercent", "stock"] as const;
const EMPTY: PartFormInput = { name: "", supplierRef: "", cost: "", markupPercent: "", stock: "" };

function formOf(p: PartView, currency: Currency): PartFormInput {
  return {
    name: p.name,
    supplierRef: p.supplierRef ?? "",
    cost: formatMinor(p.costMinor, currency.exponent),
    markupPercent: p.markupBp === null ? "" : String(p.markupBp / 100),
    stock: p.stock === null ? "" : String(p.stock),
  };
}

/** Add (no part) or edit (a part): the same fields, the same messages as the server's. */
function PartForm({
  part,
  currency,
  defaultMarkupPercent,
  onDone,
}: {
  part: PartView | null;
  currency: Currency;
  defaultMarkupPercent: string;
  onDone: (p: PartView | null) => void;
}) {
  const idp = part ? `edit-${part.id.slice(0, 8)}` : "part";
  const { register, handleSubmit, formState, setError, reset } = useForm<PartFormInput, unknown, PartFormValues>({
    resolver: zodResolver(partFormSchema),
    defaultValues: part ? formOf(part, currency) : EMPTY,
  });
  const { errors } = formState;
  const [problem, setProblem] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: (values: PartFormValues) =>
      part
        ? officeFetch<{ part: PartView }>(`/api/office/parts/${part.id}`, { method: "PATCH", json: values })
        : officeFetch<{ part: PartView }>("/api/office/parts", { method: "POST", json: values }),
    onSuccess: ({ part: saved }) => {
      setProblem(null);
      if (!part) reset(EMPTY);
      onDone(saved);
    },
    onError: (e) => {
      if (e instanceof ApiError && e.fields)
        for (const [field, message] of Object.entries(e.fields))
          if ((FIELDS as readonly string[]).includes(field)) setError(field as (typeof FIELDS)[number], { type: "server", message });
      setProblem(errorText(e));
    },
  });
  const text = (name: (typeof FIELDS)[number], label: string, hint: string, inputMode?: "decimal" | "numeric") => (
    <Field id={`${idp}-${name}`} label={label} hint={hint} error={errors[name]?.message}>
      <input
        id={`${idp}-${name}`}
        type="text"
        inputMode={inputMode}
        className="field-input"
        autoComplete="off"
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={describedBy(`${idp}-${name}`, { error: errors[name], hint })}
        {...register(name)}
      />
    </Field>
  );
  return (
    <form
      noValidate
      aria-label={part ? `Edit ${part.name}` : "Add a part"}
      onSubmit={handleSubmit((v) => save.mutate(v))}
      className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3"
    >
      {text("name", "Name", "As printed on the estimate, e.g. Dial cord, braided, 2 m.")}
      {text("supplierRef", "Supplier reference", "Optional: the supplier's number, to search by.")}
      {text("cost", `Cost (${currency.code})`, `What one costs the shop, e.g. 4.50. Never shown to set owners.`, "decimal")}
      {text("markupPercent", "Markup (%)", `Leave empty for the shop's default (${defaultMarkupPercent} %).`, "decimal")}
      {text("stock", "In stock", "Optional: leave empty if the shop does not count this part.", "numeric")}
      <div className="flex flex-wrap items-end gap-2 sm:col-span-2 lg:col-span-3">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          {save.isPending ? "Saving…" : part ? "Save the part" : "Add the part"}
        </button>
        {part ? (
          <button type="button" className="btn-secondary" onClick={() => onDone(null)}>
            Cancel
          </button>
        ) : null}
        {problem ? (
          <p className="field-error w-full" role="alert">
            {problem}
          </p>
        ) : null}
      </div>
    </form>
  );
}

export function PartsCatalogue({
  initial,
  currency,
  defaultMarkupBp,
}: {
  initial: PartView[];
  currency: Currency;
  defaultMarkupBp: number;
}) {
  const qc = useQueryClient();
  const [text, setText] = useState("");
  const [q, setQ] = useState("");
  const [show, setShow] = useState<Show>("active");
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 250);
    return () => clearTimeout(t);
  }, [text]);
  const key = officeKeys.parts(q, show);
  const { data: parts = initial, isFetching } = useQuery({
    queryKey: key,
    queryFn: async () => (await officeFetch<{ parts: PartView[] }>(`/api/office/parts?q=${encodeURIComponent(q)}&show=${show}`)).parts,
    initialData: q === "" && show === "active" ? initial : undefined,
  });
  const [outcome, setOutcome] = useState<Outcome>(null);
  const [editing, setEditing] = useState<string | null>(null);
  const refresh = () => void qc.invalidateQueries({ queryKey: officeKeys.allParts() });
  const m = (n: number) => moneyText(n, currency.code, currency.exponent);
  const defaultMarkupPercent = String(defaultMarkupBp / 100);

  const retire = useMutation({
    mutationFn: ({ id, retired }: { id: string; retired: boolean }) =>
      officeFetch<{ part: PartView }>(`/api/office/parts/${id}`, { method: "PATCH", json: { retired } }),
    onSuccess: ({ part }) => {
      setOutcome({
        tone: "success",
        text: part.retired
          ? `${part.name} retired: no longer offered for new estimates; estimates that have it keep showing it.`
          : `${part.name} is back in the catalogue.`,
      });
      refresh();
    },
    onError: (e) => setOutcome({ tone: "error", text: errorText(e) }),
  });
  const remove = useMutation({
    mutationFn: (p: PartView) => officeFetch<{ id: string }>(`/api/office/parts/${p.id}`, { method: "DELETE" }),
    onSuccess: (_r, p) => {
      setOutcome({ tone: "success", text: `${p.name} removed from the catalogue.` });
      refresh();
    },
    onError: (e) => setOutcome({ tone: "error", text: errorText(e) }),
  });

  return (
    <div className="space-y-6">
      <section aria-labelledby="catalogue-heading" className="card p-4">
        <h2 id="catalogue-heading" className="mb-2 text-lg font-semibold">
          Catalogue
        </h2>
        <div className="mb-3 flex flex-wrap items-end gap-3" role="search" aria-label="Find parts">
          <div className="w-full max-w-sm">
            <label htmlFor="parts-q" className="field-label">
              Search
            </label>
            <input
              id="parts-q"
              type="search"
              className="field-input w-full"
              placeholder="Name or supplier reference"
              value={text}
              onChange={(e) => setText(e.target.value)}
            />
          </div>
          <div>
            <label htmlFor="parts-show" className="field-label">
              Show
            </label>
            <select id="parts-show" className="field-input" value={show} onChange={(e) => setShow(e.target.value as Show)}>
              <option value="active">In the catalogue</option>
              <option value="retired">Retired</option>
              <option value="all">All</option>
            </select>
          </div>
          <p className="text-xs text-bakelite-muted" role="status" aria-live="polite">
            {isFetching ? "Searching…" : `${parts.length} part${parts.length === 1 ? "" : "s"}`}
          </p>
        </div>
        {outcome ? (
          <Notice tone={outcome.tone} live>
            {outcome.text}
          </Notice>
        ) : null}
        <TableScroll label="Parts">
          <table className="dense-table w-full">
            <thead>
              <tr>
                <th scope="col">Part</th>
                <th scope="col" className="text-right">
                  Cost
                </th>
                <th scope="col" className="text-right">
                  Markup
                </th>
                <th scope="col" className="text-right">
                  Price each
                </th>
                <th scope="col">Stock</th>
                <th scope="col">Status</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {parts.map((p) => (
                <tr key={p.id} data-part={p.id} data-retired={p.retired ? "yes" : "no"}>
                  <th scope="row" className="min-w-[12rem] text-left font-normal">
                    <span className="font-semibold">{p.name}</span>
                    {p.supplierRef ? <span className="block figure text-xs text-bakelite-muted">Ref. {p.supplierRef}</span> : null}
                    {p.checklist ? <span className="block text-xs text-bakelite-muted">Called for by the checklist</span> : null}
                    {editing === p.id ? (
                      <div className="mt-2 min-w-[16rem]">
                        <PartForm
                          part={p}
                          currency={currency}
                          defaultMarkupPercent={defaultMarkupPercent}
                          onDone={(saved) => {
                            setEditing(null);
                            if (saved) {
                              setOutcome({
                                tone: "success",
                                text: `${saved.name} saved. Estimates already sent keep the price they were sent with.`,
                              });
                              refresh();
                            }
                          }}
                        />
                      </div>
                    ) : null}
                  </th>
                  <td className="figure text-right">{m(p.costMinor)}</td>
                  <td className="figure text-right">
                    {p.effectiveMarkupBp / 100} %
                    {p.markupBp === null ? <span className="block text-xs text-bakelite-muted">default</span> : null}
                  </td>
                  <td className="figure text-right font-semibold">{m(p.unitPriceMinor)}</td>
                  <td className="figure">{p.stock === null ? <span className="text-bakelite-muted">not counted</span> : p.stock}</td>
                  <td className="text-sm">
                    {p.retired ? "✕ Retired" : "✓ Offered"}
                    <span className="block text-xs text-bakelite-muted">
                      on {p.usedOnEstimates} estimate line{p.usedOnEstimates === 1 ? "" : "s"}
                    </span>
                  </td>
                  <td>
                    <div className="flex flex-wrap gap-1">
                      {editing !== p.id ? (
                        <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setEditing(p.id)}>
                          Edit<span className="sr-only"> {p.name}</span>
                        </button>
                      ) : null}
                      <button
                        type="button"
                        className="btn-quiet px-2 py-0.5 text-xs"
                        disabled={retire.isPending}
                        onClick={() => retire.mutate({ id: p.id, retired: !p.retired })}
                      >
                        {p.retired ? "Return to the catalogue" : "Retire"}
                        <span className="sr-only"> {p.name}</span>
                      </button>
                      {p.usedOnEstimates === 0 && !p.checklist ? (
                        <button
                          type="button"
                          className="btn-quiet px-2 py-0.5 text-xs"
                          disabled={remove.isPending}
                          onClick={() => {
                            if (window.confirm(`Remove ${p.name} from the catalogue? No sent estimate names it.`)) remove.mutate(p);
                          }}
                        >
                          Remove<span className="sr-only"> {p.name}</span>
                        </button>
                      ) : null}
                    </div>
                  </td>
                </tr>
              ))}
              {parts.length === 0 ? (
                <tr>
                  <td colSpan={7} className="text-sm text-bakelite-muted">
                    No part matches.
                  </td>
                </tr>
              ) : null}
            </tbody>
          </table>
        </TableScroll>
      </section>
      <section aria-labelledby="add-part-heading" className="card p-4">
        <h2 id="add-part-heading" className="mb-3 text-lg font-semibold">
          Add a part
        </h2>
        <PartForm
          part={null}
          currency={currency}
          defaultMarkupPercent={defaultMarkupPercent}
          onDone={(p) => {
            if (p) {
              setOutcome({ tone: "success", text: `${p.name} added to the catalogue.` });
              refresh();
            }
          }}
        />
      </section>
    </div>
  );
}
