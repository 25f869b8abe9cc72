"use client";

import {
  Bar,
  BarChart,
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";

export interface Series {
  key: string;
  label: string;
  colour: string;
  /** Bars with the same stack id are stacked. */
  stack?: string;
}

const INK = "#3d4f54";
const GRID = "#ddd6c6";

/**
 * One chart for the reports: a line (over time) or bars (by category). The table beside it holds
 * the same numbers; the chart only helps the eye, so it is one named picture and no tab stop
 * (recharts' keyboard layer is off: it made each chart an unnamed stop of its own).
 */
export function ReportChart({
  type,
  data,
  xKey,
  series,
  unit,
  label,
}: {
  type: "line" | "bar";
  data: Record<string, string | number | null>[];
  xKey: string;
  series: Series[];
  unit: string;
  label: string;
}) {
  if (!data.length)
    return (
      <p className="flex h-56 items-center justify-center rounded-md bg-paper-sunk text-sm text-ink-faint">
        No figures in this period.
      </p>
    );
  const fmt = (v: unknown) =>
    typeof v === "number"
      ? `${v.toLocaleString("en", { maximumFractionDigits: 2 })}${unit === "%" ? " %" : unit ? ` ${unit}` : ""}`
      : String(v ?? "–");
  const axis = { stroke: INK, fontSize: 14, tickLine: false };
  return (
    <figure role="img" aria-label={`${label} (the table beside it gives the figures)`} className="h-64 w-full">
      <ResponsiveContainer width="100%" height="100%">
        {type === "line" ? (
          <LineChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke={GRID} strokeDasharray="3 3" />
            <XAxis dataKey={xKey} {...axis} />
            <YAxis
              {...axis}
              width={48}
              unit={unit === "%" ? "%" : ""}
              domain={unit === "%" ? [0, 100] : ["auto", "auto"]}
            />
            <Tooltip formatter={(v) => fmt(v)} />
            {series.length > 1 && <Legend />}
            {series.map((s) => (
              <Line
                key={s.key}
                type="monotone"
                dataKey={s.key}
                name={s.label}
                stroke={s.colour}
                strokeWidth={2.5}
                dot={{ r: 3 }}
                connectNulls
                isAnimationActive={false}
              />
            ))}
          </LineChart>
        ) : (
          <BarChart accessibilityLayer={false} data={data} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke={GRID} strokeDasharray="3 3" vertical={false} />
            <XAxis
              dataKey={xKey}
              {...axis}
              interval={0}
              {...(data.length > 4 ? { angle: -35, textAnchor: "end", height: 56 } : {})}
            />
            <YAxis {...axis} width={56} />
            <Tooltip formatter={(v) => fmt(v)} />
            {series.length > 1 && <Legend />}
            {series.map((s) => (
              <Bar
                key={s.key}
                dataKey={s.key}
                name={s.label}
                fill={s.colour}
                stackId={s.stack}
                isAnimationActive={false}
                radius={s.stack ? 0 : [3, 3, 0, 0]}
              />
            ))}
          </BarChart>
        )}
      </ResponsiveContainer>
    </figure>
  );
}
