"use client";

import { CartesianGrid, Legend, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ErrorPoint } from "@/lib/engine/alignment/tracking";
import { formatNumber } from "@/lib/engine/verdicts";

type Props = {
  curve: ErrorPoint[];
  trackingPointsKHz: readonly number[];
  minimaxCurve?: ErrorPoint[] | null;
  unit?: "kHz" | "MHz";
  /** Worst-case sensitivity loss of the plotted design and of the least-loss points, dB at loadedQ. */
  sensitivityLossDb?: number | null;
  minimaxSensitivityLossDb?: number | null;
  loadedQ?: number;
};

// The tracking error across the band (received frequency minus dial frequency), with the tracking points
// marked where the error is zero by design.
export function TrackingPlot({
  curve,
  trackingPointsKHz,
  minimaxCurve,
  unit = "kHz",
  sensitivityLossDb = null,
  minimaxSensitivityLossDb = null,
  loadedQ,
}: Props) {
  const scale = unit === "MHz" ? 1000 : 1;
  // Each curve keeps its own samples: the two sets of tracking points add points at different places.
  const data = curve.map((p) => ({ f: p.kHz / scale, error: p.errorKHz }));
  const minimax = minimaxCurve?.map((p) => ({ f: p.kHz / scale, error: p.errorKHz })) ?? null;
  const maxAbs = Math.max(...curve.map((p) => Math.abs(p.errorKHz)), 0);
  return (
    <figure
      className="space-y-1"
      aria-labelledby="tracking-plot-caption"
      data-points={curve.length}
      data-tracking-points={trackingPointsKHz.length}
    >
      <div className="h-72 w-full" data-testid="tracking-plot">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 10, right: 20, bottom: 24, left: 10 }}>
            <CartesianGrid stroke="#d9cfbf" strokeDasharray="3 3" />
            <XAxis
              dataKey="f"
              type="number"
              allowDuplicatedCategory={false}
              domain={["dataMin", "dataMax"]}
              tickFormatter={(v: number) => formatNumber(v, 2)}
              label={{ value: `Dial frequency, ${unit}`, position: "insideBottom", offset: -12 }}
            />
            <YAxis
              tickFormatter={(v: number) => formatNumber(v, 2)}
              label={{ value: "Tracking error, kHz", angle: -90, position: "insideLeft", offset: 0 }}
            />
            <Tooltip
              formatter={(v) => `${formatNumber(Number(v), 3)} kHz`}
              labelFormatter={(v) => `${formatNumber(Number(v), 3)} ${unit}`}
            />
            <Legend verticalAlign="top" height={24} />
            <ReferenceLine y={0} stroke="#6b5f55" />
            <Line
              name="Chosen tracking points"
              type="monotone"
              data={data}
              dataKey="error"
              stroke="#9c3d1c"
              strokeWidth={2}
              isAnimationActive={false}
              dot={(props: { cx?: number; cy?: number; index?: number }) => (
                <circle key={`pt-${props.index}`} data-curve-point={props.index} cx={props.cx} cy={props.cy} r={1.6} fill="#9c3d1c" />
              )}
              activeDot={{ r: 4 }}
            />
            {minimax ? (
              <Line
                name="Least-loss points"
                type="monotone"
                data={minimax}
                dataKey="error"
                stroke="#2f5d6b"
                strokeDasharray="5 3"
                strokeWidth={1.5}
                dot={false}
                isAnimationActive={false}
              />
            ) : null}
            {trackingPointsKHz.map((f, i) => (
              <ReferenceDot
                key={f}
                x={f / scale}
                y={0}
                r={6}
                ifOverflow="extendDomain"
                shape={(props: { cx?: number; cy?: number }) => (
                  <g data-tracking-point={i} aria-label={`Tracking point ${i + 1}: ${formatNumber(f / scale, 3)} ${unit}`}>
                    <rect
                      x={(props.cx ?? 0) - 5}
                      y={(props.cy ?? 0) - 5}
                      width={10}
                      height={10}
                      fill="#ffffff"
                      stroke="#2a2320"
                      strokeWidth={2}
                      transform={`rotate(45 ${props.cx ?? 0} ${props.cy ?? 0})`}
                    />
                  </g>
                )}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption id="tracking-plot-caption" className="text-xs text-bakelite-muted">
        Tracking error across the band, {curve.length} points; the {trackingPointsKHz.length} tracking points are marked ◆ on the zero line.
        Largest error {formatNumber(maxAbs, 2)} kHz.
        {sensitivityLossDb !== null ? (
          <span data-plot-loss="chosen">
            {" "}
            Worst sensitivity loss {formatNumber(sensitivityLossDb, 2)} dB
            {loadedQ !== undefined ? ` at loaded Q ${formatNumber(loadedQ)}` : ""}
            {minimaxSensitivityLossDb !== null ? `; with the least-loss points ${formatNumber(minimaxSensitivityLossDb, 2)} dB` : ""}. The
            same error costs more at the low end, where the antenna circuit is narrowest.
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}
