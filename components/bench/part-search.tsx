"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect, useId, useState } from "react";
import { api, errorText } from "@/lib/client/bench-api";
import { benchKeys } from "@/lib/client/bench-query-keys";
import { moneyText } from "@/lib/validation/estimate";
import type { PartSearchHit } from "@/lib/server/services/parts";

/** In stock, in words: counted parts say how many, others that the shop does not count them. */
export function stockWords(stock: number | null): string {
  if (stock === null) return "not counted";
  if (stock <= 0) return stock === 0 ? "none in stock" : `none in stock (${-stock} short)`;
  return `${stock} in stock`;
}

/**
 * The catalogue type-ahead (a combobox): typing searches parts by name or supplier reference, the arrow keys
 * move through the answers, Enter adds the highlighted one, Escape closes the list.
 */
export function PartSearch({ currency, onPick }: { currency: { code: string; exponent: number }; onPick: (hit: PartSearchHit) => void }) {
  const id = useId();
  const listId = `${id}-list`;
  const [text, setText] = useState("");
  const [q, setQ] = useState("");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 200);
    return () => clearTimeout(t);
  }, [text]);
  const search = useQuery({
    queryKey: benchKeys.partSearch(q),
    queryFn: () => api<{ parts: PartSearchHit[] }>(`/api/bench/parts?q=${encodeURIComponent(q)}&limit=8`),
    enabled: open,
    staleTime: 30_000,
  });
  const hits = search.data?.parts ?? [];
  const pick = (hit: PartSearchHit | undefined) => {
    if (!hit) return;
    onPick(hit);
    setText("");
    setOpen(false);
    setActive(0);
  };
  const m = (n: number) => moneyText(n, currency.code, currency.exponent);
  const optionId = (i: number) => `${id}-opt-${i}`;
  return (
    <div className="relative w-full max-w-md">
      <label htmlFor={`${id}-input`} className="field-label text-xs">
        Add a part from the catalogue
      </label>
      <input
        id={`${id}-input`}
        type="text"
        role="combobox"
        autoComplete="off"
        className="field-input mt-0 w-full py-1 text-sm"
        placeholder="Name or supplier reference"
        aria-expanded={open}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={open && hits[active] ? optionId(active) : undefined}
        aria-describedby={`${id}-hint`}
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
          setActive(0);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        onKeyDown={(e) => {
          if (e.key === "ArrowDown") {
            e.preventDefault();
            setOpen(true);
            setActive((a) => (hits.length ? (a + 1) % hits.length : 0));
          } else if (e.key === "ArrowUp") {
            e.preventDefault();
            setActive((a) => (hits.length ? (a - 1 + hits.length) % hits.length : 0));
          } else if (e.key === "Enter") {
            // Enter picks a part here; it never saves the estimate from this field.
            e.preventDefault();
            if (open) pick(hits[active]);
          } else if (e.key === "Escape") {
            setOpen(false);
          }
        }}
      />
      <p id={`${id}-hint`} className="sr-only">
        Type to search; use the up and down arrows to choose and Enter to add.
      </p>
      {open ? (
        <ul
          id={listId}
          role="listbox"
          aria-label="Catalogue parts"
          className="card absolute left-0 right-0 z-20 mt-1 max-h-72 overflow-y-auto p-1 text-sm shadow"
        >
          {search.isError ? (
            <li role="option" aria-selected={false} aria-disabled="true" className="px-2 py-1 text-fail">
              {errorText(search.error)}
            </li>
          ) : search.isPending ? (
            <li role="option" aria-selected={false} aria-disabled="true" className="px-2 py-1 text-bakelite-muted">
              Searching…
            </li>
          ) : hits.length === 0 ? (
            <li role="option" aria-selected={false} aria-disabled="true" className="px-2 py-1 text-bakelite-muted">
              No part in the catalogue matches.
            </li>
          ) : (
            hits.map((h, i) => (
              <li
                key={h.id}
                id={optionId(i)}
                role="option"
                aria-selected={i === active}
                data-part={h.id}
                className={`cursor-pointer rounded px-2 py-1 ${i === active ? "bg-dial-deep outline outline-1 outline-bakelite-muted" : ""}`}
                onMouseDown={(e) => e.preventDefault()}
                onMouseEnter={() => setActive(i)}
                onClick={() => pick(h)}
              >
                <span className="font-semibold">{h.name}</span>
                {h.supplierRef ? <span className="text-bakelite-muted"> · {h.supplierRef}</span> : null}
                <span className="block text-xs text-bakelite-muted">
                  <span className="figure">{m(h.unitPriceMinor)}</span> each (cost <span className="figure">{m(h.costMinor)}</span>,{" "}
                  {h.effectiveMarkupBp / 100} % markup) · {stockWords(h.stock)}
                </span>
              </li>
            ))
          )}
        </ul>
      ) : null}
    </div>
  );
}
