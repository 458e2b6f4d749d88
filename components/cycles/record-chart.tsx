import { type ChartAnnotations, chartDomains, linearScale, polylinePoints, thinSamples, timeStepSeconds } from "@/lib/cycles/chart-geometry";
import type { CycleSample } from "@/lib/cycles/record";
import { formatDuration } from "@/lib/machines/requirements";

// The time/temperature (and, when recorded, pressure) curve of one machine cycle, drawn as SVG
// by hand so it prints sharply: the requirement band (a steriliser's low–high band, or a washer's
// minimum temperature as a line), the holding period shaded and hatched, markers such as the end
// of the disinfection stage, and the computed figures written above the plot. Lines differ by
// pattern as well as colour (solid temperature, dashed pressure, dotted limits), so the chart reads
// in greyscale. A details/summary below holds the key points and the samples as a table.
// Used on the washer batch page and the steriliser load page; a server component.

/**
 * The props of the cycle record chart: the samples and a title, plus the annotations
 * (`band`, `bandLabel`, `hold`, `figures`, `markers`; see ChartAnnotations in
 * lib/cycles/chart-geometry.ts, which the one-page PDF shares).
 */
export interface RecordChartProps extends ChartAnnotations {
  /** The record, seconds from its start (`t`), °C, and kPa absolute when recorded; thinned to about 600 points for drawing. */
  samples: CycleSample[];
  /** Names the chart on screen, for screen readers and the table. */
  title: string;
}

const W = 860;
const H = 380;
const TOP = 58;
const BOTTOM = 48;
const LEFT = 56;

const n1 = (v: number) => String(Number(v.toFixed(1)));

/** Samples at the moments a reader looks for: start, hold start and end, hottest, end. */
function keyPoints(samples: CycleSample[], hold?: { fromT: number; toT: number }): { what: string; s: CycleSample }[] {
  const nearest = (t: number) => samples.reduce((best, s) => (Math.abs(s.t - t) < Math.abs(best.t - t) ? s : best), samples[0]!);
  const hottest = samples.reduce((best, s) => (s.tempC > best.tempC ? s : best), samples[0]!);
  const points = [{ what: "Start of the record", s: samples[0]! }];
  if (hold) points.push({ what: "Hold begins", s: nearest(hold.fromT) }, { what: "Hold ends", s: nearest(hold.toT) });
  points.push({ what: "Highest temperature", s: hottest }, { what: "End of the record", s: samples[samples.length - 1]! });
  return points.sort((a, b) => a.s.t - b.s.t);
}

export function RecordChart({ samples: allSamples, band, bandLabel, hold, figures, markers = [], title }: RecordChartProps) {
  if (allSamples.length < 2) {
    return <p className="text-sm text-muted">The record has too few samples to draw.</p>;
  }
  const samples = thinSamples(allSamples, 600);
  const domains = chartDomains(samples, band);
  const hasPressure = domains.pressure !== null;
  const right = hasPressure ? 64 : 20;
  const x = linearScale(domains.t0, domains.t1, LEFT, W - right);
  const y = linearScale(domains.temp.min, domains.temp.max, H - BOTTOM, TOP);
  const yp = domains.pressure ? linearScale(domains.pressure.min, domains.pressure.max, H - BOTTOM, TOP) : null;
  const step = timeStepSeconds(domains.t1 - domains.t0);
  const xTicks: number[] = [];
  for (let t = 0; t <= domains.t1 - domains.t0 + 1e-9; t += step) xTicks.push(domains.t0 + t);
  const plotH = H - TOP - BOTTOM;
  const bandText =
    bandLabel ?? (band ? (band.highC !== undefined ? `${n1(band.lowC)}–${n1(band.highC)} °C band` : `${n1(band.lowC)} °C minimum`) : null);
  const temps = allSamples.map((s) => s.tempC);
  const summary = `${title}: ${allSamples.length} samples over ${formatDuration(domains.t1 - domains.t0)}, from ${n1(Math.min(...temps))} to ${n1(
    Math.max(...temps),
  )} °C.${hold ? ` Held from ${formatDuration(hold.fromT - domains.t0)} to ${formatDuration(hold.toT - domains.t0)} into the record.` : " No hold."} ${figures
    .map((f) => `${f.label} ${f.value}`)
    .join("; ")}.`;
  const tableRows = thinSamples(allSamples, 120);
  const id = title.replace(/[^A-Za-z0-9]+/g, "-").toLowerCase();

  return (
    <figure className="space-y-3" data-testid="record-chart">
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full text-ink" role="img" aria-label={summary}>
        <defs>
          <pattern id={`${id}-hold`} width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <rect width="8" height="8" className="fill-ok-50" />
            <line x1="0" y1="0" x2="0" y2="8" className="stroke-ok-600" strokeOpacity={0.35} strokeWidth={2} />
          </pattern>
          <pattern id={`${id}-band`} width="6" height="6" patternUnits="userSpaceOnUse">
            <rect width="6" height="6" className="fill-ember-50" />
            <circle cx="3" cy="3" r="0.9" className="fill-ember-600" fillOpacity={0.45} />
          </pattern>
        </defs>

        {/* The computed figures, written on the chart so they print with it. */}
        <text x={LEFT} y={20} className="fill-ink text-[13px] font-semibold">
          {title}
        </text>
        <text x={LEFT} y={40} className="fill-ink-soft text-[12px]" data-testid="record-chart-figures">
          {figures.map((f, i) => (
            <tspan key={f.label}>
              {i > 0 ? "   ·   " : ""}
              <tspan className="font-semibold">{f.label}</tspan> {f.value}
            </tspan>
          ))}
        </text>

        {hold && (
          <g>
            <rect x={x(hold.fromT)} y={TOP} width={Math.max(1, x(hold.toT) - x(hold.fromT))} height={plotH} fill={`url(#${id}-hold)`} />
            <text x={x(hold.fromT) + 4} y={H - BOTTOM - 6} className="fill-ok-700 text-[11px] font-semibold">
              hold
            </text>
          </g>
        )}
        {band && band.highC !== undefined && (
          <rect x={LEFT} y={y(band.highC)} width={W - right - LEFT} height={Math.max(1, y(band.lowC) - y(band.highC))} fill={`url(#${id}-band)`} fillOpacity={0.9} />
        )}

        {domains.temp.ticks.map((c) => (
          <g key={`y${c}`}>
            <line x1={LEFT} x2={W - right} y1={y(c)} y2={y(c)} className="stroke-line" strokeWidth={1} />
            <text x={LEFT - 8} y={y(c) + 4} textAnchor="end" className="fill-muted text-[11px]">
              {c}
            </text>
          </g>
        ))}
        {domains.pressure &&
          yp &&
          domains.pressure.ticks.map((p) => (
            <text key={`p${p}`} x={W - right + 8} y={yp(p) + 4} className="fill-muted text-[11px]">
              {p}
            </text>
          ))}
        {xTicks.map((t) => (
          <g key={`x${t}`}>
            <line x1={x(t)} x2={x(t)} y1={H - BOTTOM} y2={H - BOTTOM + 4} className="stroke-line-strong" />
            <text x={x(t)} y={H - BOTTOM + 17} textAnchor="middle" className="fill-muted text-[11px]">
              {Math.round((t - domains.t0) / 60)}
            </text>
          </g>
        ))}
        <text x={(LEFT + W - right) / 2} y={H - 8} textAnchor="middle" className="fill-muted text-[11px]">
          minutes from the start of the record
        </text>
        <text x={14} y={TOP + plotH / 2} transform={`rotate(-90 14 ${TOP + plotH / 2})`} textAnchor="middle" className="fill-muted text-[11px]">
          temperature, °C
        </text>
        {hasPressure && (
          <text x={W - 10} y={TOP + plotH / 2} transform={`rotate(90 ${W - 10} ${TOP + plotH / 2})`} textAnchor="middle" className="fill-muted text-[11px]">
            pressure, kPa absolute
          </text>
        )}

        {band && (
          <g>
            <line x1={LEFT} x2={W - right} y1={y(band.lowC)} y2={y(band.lowC)} className="stroke-ember-600" strokeDasharray="2 3" strokeWidth={1.5} />
            {band.highC !== undefined && (
              <line x1={LEFT} x2={W - right} y1={y(band.highC)} y2={y(band.highC)} className="stroke-ember-600" strokeDasharray="2 3" strokeWidth={1.5} />
            )}
            <text x={W - right - 4} y={y(band.highC ?? band.lowC) - 5} textAnchor="end" className="fill-ember-700 text-[11px] font-semibold">
              {bandText}
            </text>
          </g>
        )}
        {markers.map((m) => (
          <g key={`m${m.t}`}>
            <line x1={x(m.t)} x2={x(m.t)} y1={TOP} y2={H - BOTTOM} className="stroke-ink-soft" strokeDasharray="6 3 1 3" strokeWidth={1} />
            <text x={x(m.t) + 4} y={TOP + 12} className="fill-ink-soft text-[11px]">
              {m.label}
            </text>
          </g>
        ))}

        {hasPressure && yp && (
          <polyline
            points={polylinePoints(samples, x, yp, (s) => s.pressureKpaAbs)}
            fill="none"
            className="stroke-ink-soft"
            strokeWidth={1.5}
            strokeDasharray="7 4"
            strokeLinejoin="round"
            data-testid="record-chart-pressure"
          />
        )}
        <polyline points={polylinePoints(samples, x, y, (s) => s.tempC)} fill="none" className="stroke-lagoon-700" strokeWidth={2.25} strokeLinejoin="round" />

        <line x1={LEFT} x2={LEFT} y1={TOP} y2={H - BOTTOM} className="stroke-line-strong" strokeWidth={1} />
        {hasPressure && <line x1={W - right} x2={W - right} y1={TOP} y2={H - BOTTOM} className="stroke-line-strong" strokeWidth={1} />}
        <line x1={LEFT} x2={W - right} y1={H - BOTTOM} y2={H - BOTTOM} className="stroke-line-strong" strokeWidth={1} />
      </svg>

      <figcaption className="flex flex-wrap items-center gap-x-5 gap-y-1 text-xs text-ink-soft">
        <LegendLine className="stroke-lagoon-700" width={2.25} /> Temperature
        {hasPressure && (
          <>
            <LegendLine className="stroke-ink-soft" width={1.5} dash="7 4" /> Pressure
          </>
        )}
        {bandText && (
          <>
            <LegendLine className="stroke-ember-600" width={1.5} dash="2 3" /> {bandText}
          </>
        )}
        {hold && (
          <>
            <svg width="22" height="12" aria-hidden="true">
              <rect width="22" height="12" fill={`url(#${id}-hold)`} stroke="currentColor" strokeOpacity={0.3} />
            </svg>{" "}
            Hold, {formatDuration(hold.toT - hold.fromT)}
          </>
        )}
      </figcaption>

      <details className="rounded-lg border border-line px-3 py-2 text-sm">
        <summary className="cursor-pointer font-medium text-ink">The curve as a table</summary>
        <table className="mt-2 w-full text-left text-sm" data-testid="record-chart-key-points">
          <caption className="sr-only">Key points of {title}</caption>
          <thead className="text-xs text-muted">
            <tr>
              <th className="py-1 pr-3 font-medium">Point</th>
              <th className="py-1 pr-3 font-medium">Time into the record</th>
              <th className="py-1 pr-3 font-medium">Temperature</th>
              {hasPressure && <th className="py-1 font-medium">Pressure</th>}
            </tr>
          </thead>
          <tbody className="divide-y divide-line tabular-nums">
            {keyPoints(allSamples, hold).map((p) => (
              <tr key={`${p.what}-${p.s.t}`}>
                <td className="py-1 pr-3">{p.what}</td>
                <td className="py-1 pr-3">{formatDuration(p.s.t - domains.t0)}</td>
                <td className="py-1 pr-3">{n1(p.s.tempC)} °C</td>
                {hasPressure && <td className="py-1">{p.s.pressureKpaAbs !== undefined ? `${n1(p.s.pressureKpaAbs)} kPa` : "—"}</td>}
              </tr>
            ))}
          </tbody>
        </table>
        <table className="mt-4 w-full text-left text-sm">
          <caption className="py-1 text-left text-xs text-muted">
            {tableRows.length < allSamples.length ? `${tableRows.length} of the ${allSamples.length} samples, keeping each stretch's lowest and highest` : "Every sample"}
          </caption>
          <thead className="text-xs text-muted">
            <tr>
              <th className="py-1 pr-3 font-medium">Time</th>
              <th className="py-1 pr-3 font-medium">°C</th>
              {hasPressure && <th className="py-1 pr-3 font-medium">kPa abs</th>}
              <th className="py-1 font-medium">Stage</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-line tabular-nums">
            {tableRows.map((s) => (
              <tr key={s.t}>
                <td className="py-0.5 pr-3">{formatDuration(s.t - domains.t0)}</td>
                <td className="py-0.5 pr-3">{n1(s.tempC)}</td>
                {hasPressure && <td className="py-0.5 pr-3">{s.pressureKpaAbs !== undefined ? n1(s.pressureKpaAbs) : "—"}</td>}
                <td className="py-0.5">{s.phase ?? ""}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}

function LegendLine({ className, width, dash }: { className: string; width: number; dash?: string }) {
  return (
    <svg width="26" height="10" aria-hidden="true" className="inline-block">
      <line x1="1" x2="25" y1="5" y2="5" className={className} strokeWidth={width} strokeDasharray={dash} />
    </svg>
  );
}
