"use client";

import { useId } from "react";
import {
  Bar,
  BarChart,
  CartesianGrid,
  LabelList,
  Legend,
  Line,
  LineChart,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { ReportChart as Chart } from "@/lib/reports/types";

// A report's chart as SVG. Series differ by more than colour, so the chart reads in black and
// white and for colour-blind readers: bars carry a fill pattern, lines a marker shape and a dash
// pattern, and each line is labelled with its name at its last point. The colours are the
// Okabe–Ito palette (Okabe & Ito, "Color Universal Design", 2008), told apart by the common forms
// of colour blindness.

const COLOURS = ["#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00", "#000000", "#F0E442"];
const DASHES = ["", "6 3", "2 3", "10 4 2 4", "1 2", "12 3"];
const PATTERNS = ["solid", "diagonal", "dots", "cross", "horizontal", "vertical", "back-diagonal", "grid"] as const;
type Shape = "circle" | "square" | "triangle" | "diamond" | "cross" | "star";
const SHAPES: Shape[] = ["circle", "square", "triangle", "diamond", "cross", "star"];

function Marker({ cx, cy, shape, colour }: { cx?: number; cy?: number; shape: Shape; colour: string }) {
  if (cx === undefined || cy === undefined || Number.isNaN(cx) || Number.isNaN(cy)) return null;
  const r = 4.5;
  const common = { fill: colour, stroke: "#ffffff", strokeWidth: 1 };
  switch (shape) {
    case "square":
      return <rect x={cx - r} y={cy - r} width={2 * r} height={2 * r} {...common} />;
    case "triangle":
      return <polygon points={`${cx},${cy - r - 1} ${cx + r + 1},${cy + r} ${cx - r - 1},${cy + r}`} {...common} />;
    case "diamond":
      return <polygon points={`${cx},${cy - r - 1} ${cx + r + 1},${cy} ${cx},${cy + r + 1} ${cx - r - 1},${cy}`} {...common} />;
    case "cross":
      return <path d={`M${cx - r},${cy - r}L${cx + r},${cy + r}M${cx - r},${cy + r}L${cx + r},${cy - r}`} stroke={colour} strokeWidth={2.5} />;
    case "star":
      return <polygon points={`${cx},${cy - r - 2} ${cx + 2},${cy - 2} ${cx + r + 2},${cy} ${cx + 2},${cy + 2} ${cx},${cy + r + 2} ${cx - 2},${cy + 2} ${cx - r - 2},${cy} ${cx - 2},${cy - 2}`} {...common} />;
    default:
      return <circle cx={cx} cy={cy} r={r} {...common} />;
  }
}

function PatternDefs({ prefix }: { prefix: string }) {
  return (
    <svg width="0" height="0" aria-hidden="true" focusable="false" style={{ position: "absolute" }}>
      <defs>
        {COLOURS.map((colour, i) => {
          const kind = PATTERNS[i % PATTERNS.length]!;
          const id = `${prefix}-p${i}`;
          return (
            <pattern key={id} id={id} width="8" height="8" patternUnits="userSpaceOnUse">
              <rect width="8" height="8" fill={kind === "solid" ? colour : "#ffffff"} />
              {kind === "diagonal" && <path d="M-2,2 l4,-4 M0,8 l8,-8 M6,10 l4,-4" stroke={colour} strokeWidth="2.2" />}
              {kind === "back-diagonal" && <path d="M-2,6 l4,4 M0,0 l8,8 M6,-2 l4,4" stroke={colour} strokeWidth="2.2" />}
              {kind === "dots" && (
                <>
                  <rect width="8" height="8" fill={colour} opacity="0.25" />
                  <circle cx="4" cy="4" r="2.2" fill={colour} />
                </>
              )}
              {kind === "cross" && <path d="M0,0 l8,8 M8,0 l-8,8" stroke={colour} strokeWidth="1.6" />}
              {kind === "horizontal" && <path d="M0,2 h8 M0,6 h8" stroke={colour} strokeWidth="2" />}
              {kind === "vertical" && <path d="M2,0 v8 M6,0 v8" stroke={colour} strokeWidth="2" />}
              {kind === "grid" && <path d="M0,4 h8 M4,0 v8" stroke={colour} strokeWidth="1.6" />}
            </pattern>
          );
        })}
      </defs>
    </svg>
  );
}

/** The chart of one report: a line per series, or bars (grouped or stacked) with patterns. */
export function ReportChart({ chart }: { chart: Chart }) {
  const prefix = useId().replaceAll(":", "");
  const hasData = chart.points.some((p) => chart.series.some((s) => typeof p[s.key] === "number" && (p[s.key] as number) !== 0));
  const reference = chart.reference?.value;
  // A reference line (a capacity) stays in view even when every bar is far below it.
  const domain: [number, number | ((max: number) => number)] | undefined =
    chart.unit === "%" ? [0, 100] : reference !== undefined ? [0, (max: number) => Math.ceil(Math.max(max, reference * 1.05))] : undefined;
  const fewPoints = chart.points.length <= 14 && chart.series.length <= 3;
  // Direct labels at the ends of lines: series ending close together are stacked 12 px apart.
  const labelOffset = new Map<string, number>();
  if (chart.kind === "line") {
    const ends = chart.series
      .map((s) => {
        const last = [...chart.points].reverse().find((p) => typeof p[s.key] === "number");
        return { key: s.key, value: last ? (last[s.key] as number) : null };
      })
      .filter((e): e is { key: string; value: number } => e.value !== null)
      .sort((a, b) => b.value - a.value);
    const span = chart.unit === "%" ? 100 : Math.max(1, ...ends.map((e) => e.value));
    ends.forEach((e, i) => {
      const near = ends.slice(0, i).filter((o) => Math.abs(o.value - e.value) < span * 0.06).length;
      labelOffset.set(e.key, near * 12);
    });
  }
  const describe = `${chart.title}. ${chart.series.length} series: ${chart.series.map((s) => s.label).join(", ")}. The table below lists every figure.`;

  return (
    <figure className="report-chart rounded-card border border-line bg-surface p-4 shadow-card">
      <figcaption className="mb-2 text-sm font-semibold text-ink">{chart.title}</figcaption>
      {!hasData ? (
        <p className="py-10 text-center text-sm text-muted">Nothing to draw for this period and these filters.</p>
      ) : (
        <div role="img" aria-label={describe} className="h-80 w-full">
          <PatternDefs prefix={prefix} />
          <ResponsiveContainer width="100%" height="100%">
            {chart.kind === "line" ? (
              <LineChart data={chart.points} margin={{ top: 10, right: 120, bottom: 24, left: 8 }}>
                <CartesianGrid stroke="#ddd8cc" strokeDasharray="3 3" />
                <XAxis dataKey={chart.x} tick={{ fontSize: 11, fill: "#3b4a4f" }} label={{ value: chart.xLabel, position: "insideBottom", offset: -16, fontSize: 12, fill: "#3b4a4f" }} />
                <YAxis domain={domain} tick={{ fontSize: 11, fill: "#3b4a4f" }} label={{ value: chart.yLabel, angle: -90, position: "insideLeft", fontSize: 12, fill: "#3b4a4f" }} />
                <Tooltip />
                <Legend verticalAlign="top" height={28} />
                {chart.reference && <ReferenceLine y={chart.reference.value} stroke="#1d2a2f" strokeDasharray="8 4" label={{ value: chart.reference.label, position: "insideTopRight", fontSize: 11 }} />}
                {chart.series.map((s, i) => {
                  const colour = COLOURS[i % COLOURS.length]!;
                  const shape = SHAPES[i % SHAPES.length]!;
                  const lastIndex = chart.points.reduce((last, p, k) => (typeof p[s.key] === "number" ? k : last), -1);
                  return (
                    <Line
                      key={s.key}
                      type="linear"
                      dataKey={s.key}
                      name={s.label}
                      stroke={colour}
                      strokeWidth={2}
                      strokeDasharray={DASHES[i % DASHES.length]}
                      connectNulls
                      isAnimationActive={false}
                      legendType={shape === "cross" || shape === "star" ? "cross" : shape === "square" ? "square" : shape === "triangle" ? "triangle" : shape === "diamond" ? "diamond" : "circle"}
                      dot={(props: { cx?: number; cy?: number; index?: number }) => <Marker key={`${s.key}-${props.index}`} cx={props.cx} cy={props.cy} shape={shape} colour={colour} />}
                    >
                      <LabelList
                        dataKey={s.key}
                        content={(props: { x?: number | string; y?: number | string; index?: number }) =>
                          props.index === lastIndex ? (
                            <text x={Number(props.x) + 8} y={Number(props.y) + 4 + (labelOffset.get(s.key) ?? 0)} fontSize={11} fill={colour === "#F0E442" ? "#1d2a2f" : colour} fontWeight={600}>
                              {s.label}
                            </text>
                          ) : null
                        }
                      />
                    </Line>
                  );
                })}
              </LineChart>
            ) : (
              <BarChart data={chart.points} margin={{ top: 10, right: 16, bottom: 24, left: 8 }}>
                <CartesianGrid stroke="#ddd8cc" strokeDasharray="3 3" vertical={false} />
                <XAxis dataKey={chart.x} tick={{ fontSize: 11, fill: "#3b4a4f" }} label={{ value: chart.xLabel, position: "insideBottom", offset: -16, fontSize: 12, fill: "#3b4a4f" }} />
                <YAxis domain={domain} tick={{ fontSize: 11, fill: "#3b4a4f" }} label={{ value: chart.yLabel, angle: -90, position: "insideLeft", fontSize: 12, fill: "#3b4a4f" }} />
                <Tooltip />
                <Legend verticalAlign="top" height={28} />
                {chart.reference && <ReferenceLine y={chart.reference.value} stroke="#1d2a2f" strokeWidth={2} strokeDasharray="8 4" label={{ value: chart.reference.label, position: "insideTopRight", fontSize: 11, fill: "#1d2a2f" }} />}
                {chart.series.map((s, i) => (
                  <Bar
                    key={s.key}
                    dataKey={s.key}
                    name={s.label}
                    fill={`url(#${prefix}-p${i % COLOURS.length})`}
                    stroke={COLOURS[i % COLOURS.length]}
                    strokeWidth={1}
                    stackId={chart.kind === "stacked-bar" ? "stack" : undefined}
                    isAnimationActive={false}
                  >
                    {fewPoints && chart.kind === "bar" && <LabelList dataKey={s.key} position="top" fontSize={10} fill="#1d2a2f" />}
                  </Bar>
                ))}
              </BarChart>
            )}
          </ResponsiveContainer>
        </div>
      )}
    </figure>
  );
}
