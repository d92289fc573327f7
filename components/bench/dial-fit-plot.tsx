"use client";

import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ErrorPoint } from "@/lib/engine/alignment/tracking";
import { formatNumber } from "@/lib/engine/verdicts";

type Props = {
  before: ErrorPoint[];
  after: ErrorPoint[];
  readings: { dialKHz: number; errorKHz: number }[];
  tolerance: { absKHz: number; percent: number };
  unit?: "kHz" | "MHz";
};

// Dial error (received minus mark) across the band: as the fit explains the set now, and as predicted once the
// steps are done, with the readings themselves and the tolerance window.
export function DialFitPlot({ before, after, readings, tolerance, unit = "kHz" }: Props) {
  const scale = unit === "MHz" ? 1000 : 1;
  const now = before.map((p) => ({ f: p.kHz / scale, error: p.errorKHz }));
  const predicted = after.map((p) => ({ f: p.kHz / scale, error: p.errorKHz }));
  const window = before.map((p) => {
    const allowed = Math.max(tolerance.absKHz, (tolerance.percent / 100) * p.kHz);
    return { f: p.kHz / scale, upper: allowed, lower: -allowed };
  });
  const read = readings.map((r) => ({ f: r.dialKHz / scale, error: r.errorKHz }));
  const worst = (xs: ErrorPoint[]) => Math.max(...xs.map((p) => Math.abs(p.errorKHz)), 0);
  return (
    <figure className="space-y-1" aria-labelledby="dial-fit-plot-caption" data-readings={readings.length}>
      {/* The key in HTML, so it wraps on a phone instead of running over the curves. */}
      <ul className="flex flex-wrap gap-x-4 gap-y-0.5 text-xs" aria-label="Key to the plot">
        <li>
          <span aria-hidden="true" className="mr-1 inline-block w-5 border-t-2 align-middle" style={{ borderColor: "#9c3d1c" }} />
          Now (fitted)
        </li>
        <li>
          <span
            aria-hidden="true"
            className="mr-1 inline-block w-5 border-t-2 border-dashed align-middle"
            style={{ borderColor: "#2f5d6b" }}
          />
          After the steps (predicted)
        </li>
        <li>
          <span aria-hidden="true" className="mr-1">
            ○
          </span>
          Readings
        </li>
        <li>
          <span
            aria-hidden="true"
            className="mr-1 inline-block w-5 border-t-2 border-dotted align-middle"
            style={{ borderColor: "#8a7d6f" }}
          />
          Tolerance
        </li>
      </ul>
      <div className="h-72 w-full" data-testid="dial-fit-plot">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 10, right: 20, bottom: 24, left: 10 }}>
            <CartesianGrid stroke="#d9cfbf" strokeDasharray="3 3" />
            <XAxis
              dataKey="f"
              type="number"
              allowDuplicatedCategory={false}
              domain={["dataMin", "dataMax"]}
              tickFormatter={(v: number) => formatNumber(v, 2)}
              label={{ value: `Dial mark, ${unit}`, position: "insideBottom", offset: -12 }}
            />
            <YAxis
              tickFormatter={(v: number) => formatNumber(v, 1)}
              label={{ value: "Dial error, kHz", angle: -90, position: "insideLeft", offset: 0 }}
            />
            <Tooltip
              formatter={(v) => `${formatNumber(Number(v), 2)} kHz`}
              labelFormatter={(v) => `${formatNumber(Number(v), 3)} ${unit}`}
            />
            <ReferenceLine y={0} stroke="#6b5f55" />
            <Line
              name="Tolerance"
              data={window}
              dataKey="upper"
              stroke="#8a7d6f"
              strokeDasharray="2 4"
              dot={false}
              isAnimationActive={false}
            />
            <Line
              name="Tolerance (lower)"
              data={window}
              dataKey="lower"
              stroke="#8a7d6f"
              strokeDasharray="2 4"
              dot={false}
              isAnimationActive={false}
            />
            <Line
              name="Now (fitted)"
              type="monotone"
              data={now}
              dataKey="error"
              stroke="#9c3d1c"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
            />
            <Line
              name="After the steps (predicted)"
              type="monotone"
              data={predicted}
              dataKey="error"
              stroke="#2f5d6b"
              strokeDasharray="5 3"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
            />
            <Line
              name="Readings"
              data={read}
              dataKey="error"
              stroke="none"
              isAnimationActive={false}
              dot={(props: { cx?: number; cy?: number; index?: number }) => (
                <circle
                  key={`rd-${props.index}`}
                  data-reading-point={props.index}
                  cx={props.cx}
                  cy={props.cy}
                  r={4}
                  fill="#ffffff"
                  stroke="#2a2320"
                  strokeWidth={2}
                />
              )}
              activeDot={false}
            />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption id="dial-fit-plot-caption" className="text-xs text-bakelite-muted">
        Dial error across the band: now, as the fit explains the {readings.length} readings (○), largest {formatNumber(worst(before), 1)}{" "}
        kHz; predicted after the steps, largest {formatNumber(worst(after), 1)} kHz. The dotted lines are the tolerance.
      </figcaption>
    </figure>
  );
}
