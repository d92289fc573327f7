"use client";

import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatNumber } from "@/lib/engine/verdicts";

type Props = {
  id: string;
  /** Offsets from the IF in kHz against the response (dB relative) or the discriminator output (V). */
  points: { offsetKHz: number; value: number }[];
  curve: "response" | "discriminator";
  ifText: string;
  /** Response: the peak level and the −3 / −6 dB edges; discriminator: the crossing and the linear range. */
  marks: {
    peakDb?: number;
    edges3?: [number | null, number | null];
    edges6?: [number | null, number | null];
    crossing?: number;
    linear?: [number, number];
  };
  summary: string;
};

// The IF response (or the FM discriminator's S-curve) as read, relative to the nominal IF, with the levels
// and edges the passband figures come from.
export function PassbandPlot({ id, points, curve, ifText, marks, summary }: Props) {
  const data = points.map((p) => ({ f: p.offsetKHz, v: p.value }));
  const unit = curve === "response" ? "dB" : "V";
  const vlines = (xs: (number | null | undefined)[], stroke: string, dash: string, label: string) =>
    xs.map((x, i) =>
      x === null || x === undefined ? null : (
        <ReferenceLine key={`${label}-${i}`} x={x} stroke={stroke} strokeDasharray={dash} ifOverflow="extendDomain" />
      ),
    );
  return (
    <figure className="space-y-1" aria-labelledby={`${id}-caption`} data-points={points.length} data-curve={curve}>
      <ul className="flex flex-wrap gap-x-4 gap-y-0.5 text-xs" aria-label="Key to the plot">
        <li>
          <span aria-hidden="true" className="mr-1 inline-block w-5 border-t-2 align-middle" style={{ borderColor: "#9c3d1c" }} />
          {curve === "response" ? "Response as read" : "Discriminator output as read"}
        </li>
        <li>
          <span
            aria-hidden="true"
            className="mr-1 inline-block w-5 border-t-2 border-dashed align-middle"
            style={{ borderColor: "#2f5d6b" }}
          />
          {curve === "response" ? "−3 dB level and edges" : "Zero crossing"}
        </li>
        <li>
          <span
            aria-hidden="true"
            className="mr-1 inline-block w-5 border-t-2 border-dotted align-middle"
            style={{ borderColor: "#8a7d6f" }}
          />
          {curve === "response" ? "−6 dB level and edges" : "Linear range"}
        </li>
      </ul>
      {/* The vertical axis is named above the plot, not turned along it: a turned title is clipped on a phone. */}
      <p className="text-xs text-bakelite-muted" aria-hidden="true">
        {curve === "response" ? "Relative response, dB" : "Output, V"}
      </p>
      <div className="h-60 w-full" data-testid={`${id}-plot`} role="img" aria-label={`${ifText}: ${summary}`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 6, right: 16, bottom: 24, left: 0 }}>
            <CartesianGrid stroke="#d9cfbf" strokeDasharray="3 3" />
            <XAxis
              dataKey="f"
              type="number"
              domain={["dataMin", "dataMax"]}
              tickFormatter={(v: number) => formatNumber(v, 1)}
              label={{ value: `Offset from ${ifText}, kHz`, position: "insideBottom", offset: -12 }}
            />
            <YAxis width={48} tickFormatter={(v: number) => formatNumber(v, 2)} />
            <Tooltip
              formatter={(v) => `${formatNumber(Number(v), 2)} ${unit}`}
              labelFormatter={(v) => `${formatNumber(Number(v), 2)} kHz`}
            />
            {curve === "response" && marks.peakDb !== undefined ? (
              <>
                <ReferenceLine y={marks.peakDb - 3} stroke="#2f5d6b" strokeDasharray="5 3" />
                <ReferenceLine y={marks.peakDb - 6} stroke="#8a7d6f" strokeDasharray="2 2" />
              </>
            ) : null}
            {curve === "response" ? vlines(marks.edges3 ?? [], "#2f5d6b", "5 3", "e3") : null}
            {curve === "response" ? vlines(marks.edges6 ?? [], "#8a7d6f", "2 2", "e6") : null}
            {curve === "discriminator" ? <ReferenceLine y={0} stroke="#6b5f55" /> : null}
            {curve === "discriminator" ? vlines([marks.crossing], "#2f5d6b", "5 3", "zc") : null}
            {curve === "discriminator" ? vlines(marks.linear ?? [], "#8a7d6f", "2 2", "lin") : null}
            <Line
              type="linear"
              dataKey="v"
              stroke="#9c3d1c"
              strokeWidth={2}
              isAnimationActive={false}
              dot={(props: { cx?: number; cy?: number; index?: number }) => (
                <circle key={`pt-${props.index}`} data-sweep-point={props.index} cx={props.cx} cy={props.cy} r={2} fill="#9c3d1c" />
              )}
            />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption id={`${id}-caption`} className="text-xs text-bakelite-muted">
        {ifText}, {points.length} points: {summary}
      </figcaption>
    </figure>
  );
}
