"use client";

import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";

// The charts are a picture of the tables printed beside them; screen readers get the tables.
const AXIS = { fontSize: 12, fill: "#4a3f38" };

/** "2026-03" → "Mar 26": short enough that every bar keeps its label, tilted, even on a phone. */
function shortMonth(month: string): string {
  const m = /^(\d{4})-(\d{2})$/.exec(month);
  if (!m) return month;
  return `${MONTHS[Number(m[2]) - 1] ?? m[2]} ${m[1].slice(2)}`;
}
const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

export function JobsPerStateChart({ data }: { data: { label: string; count: number }[] }) {
  return (
    <div aria-hidden="true" className="h-72 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} layout="vertical" margin={{ left: 24, right: 16, top: 8, bottom: 8 }} accessibilityLayer={false}>
          <CartesianGrid stroke="#d9cdb8" horizontal={false} />
          <XAxis type="number" allowDecimals={false} tick={AXIS} />
          <YAxis type="category" dataKey="label" width={170} tick={AXIS} />
          <Tooltip />
          <Bar dataKey="count" name="Jobs" fill="#9c3d1c" maxBarSize={28} isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

export function MoneyChart({
  data,
  currency,
}: {
  data: { month: string; deposits: number; balances: number; refunds: number }[];
  currency: string;
}) {
  return (
    <div aria-hidden="true" className="h-72 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ left: 8, right: 16, top: 8, bottom: 8 }} accessibilityLayer={false}>
          <CartesianGrid stroke="#d9cdb8" vertical={false} />
          <XAxis dataKey="month" tick={AXIS} interval={0} angle={-35} textAnchor="end" height={48} tickFormatter={shortMonth} />
          <YAxis tick={AXIS} width={70} label={{ value: currency, angle: -90, position: "insideLeft", fill: "#4a3f38", fontSize: 12 }} />
          <Tooltip />
          <Legend formatter={(value: string) => <span style={{ color: "#2a2320" }}>{value}</span>} />
          <Bar dataKey="deposits" name="Deposits" stackId="in" fill="#8a6a22" isAnimationActive={false} />
          <Bar dataKey="balances" name="Balances" stackId="in" fill="#5b3a29" isAnimationActive={false} />
          <Bar dataKey="refunds" name="Refunds" fill="#a11d1d" isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

export function TurnaroundChart({ data }: { data: { month: string; medianDays: number | null }[] }) {
  return (
    <div aria-hidden="true" className="h-60 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} margin={{ left: 8, right: 16, top: 8, bottom: 8 }} accessibilityLayer={false}>
          <CartesianGrid stroke="#d9cdb8" vertical={false} />
          <XAxis dataKey="month" tick={AXIS} interval={0} angle={-35} textAnchor="end" height={48} tickFormatter={shortMonth} />
          <YAxis tick={AXIS} width={50} label={{ value: "days", angle: -90, position: "insideLeft", fill: "#4a3f38", fontSize: 12 }} />
          <Tooltip />
          <Bar dataKey="medianDays" name="Median days" fill="#7a5440" maxBarSize={40} isAnimationActive={false} />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
