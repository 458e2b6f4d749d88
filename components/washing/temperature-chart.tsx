import { formatDuration } from "@/lib/machines/requirements";
import type { BatchChart } from "@/lib/washing/service";

// The temperature curve of a washer batch as an SVG line chart: the hold shaded, the hold
// threshold (and the A0 lower limit, where it differs) drawn across, the end of the disinfection
// stage marked.

const W = 800;
const H = 320;
const M = { left: 52, right: 16, top: 16, bottom: 44 };

function niceStep(spanSeconds: number): number {
  const minutes = spanSeconds / 60;
  for (const step of [1, 2, 5, 10, 15, 20, 30, 60]) if (minutes / step <= 10) return step * 60;
  return 120 * 60;
}

export function TemperatureChart({ chart, title }: { chart: BatchChart; title: string }) {
  const points = chart.points;
  const t0 = points[0]?.t ?? 0;
  const t1 = Math.max(points[points.length - 1]?.t ?? 1, t0 + 1);
  const temps = points.map((p) => p.tempC);
  const yMin = Math.min(0, Math.floor(Math.min(...temps) / 10) * 10);
  const yMax = Math.ceil((Math.max(...temps, chart.thresholdC) + 5) / 10) * 10;
  const x = (t: number) => M.left + ((t - t0) / (t1 - t0)) * (W - M.left - M.right);
  const y = (c: number) => M.top + (1 - (c - yMin) / (yMax - yMin)) * (H - M.top - M.bottom);
  const line = points.map((p) => `${x(p.t).toFixed(1)},${y(p.tempC).toFixed(1)}`).join(" ");
  const yTicks: number[] = [];
  for (let c = yMin; c <= yMax; c += yMax - yMin > 100 ? 20 : 10) yTicks.push(c);
  const step = niceStep(t1 - t0);
  const xTicks: number[] = [];
  for (let t = 0; t <= t1 - t0 + 1e-9; t += step) xTicks.push(t0 + t);
  const hold = chart.holdStartS !== null && chart.holdEndS !== null ? { from: chart.holdStartS, to: chart.holdEndS } : null;
  const summary = `${title}. ${points.length} points over ${formatDuration(t1 - t0)}; highest ${Math.max(...temps).toFixed(1)} °C.${
    hold ? ` Held at or above ${chart.thresholdC} °C from ${formatDuration(hold.from)} to ${formatDuration(hold.to)} into the record.` : ` Never at or above ${chart.thresholdC} °C.`
  }`;

  return (
    <figure className="space-y-2" data-testid="temperature-chart">
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={summary}>
        {hold && (
          <rect
            x={x(hold.from)}
            y={M.top}
            width={Math.max(1, x(hold.to) - x(hold.from))}
            height={H - M.top - M.bottom}
            className="fill-ok-50"
          />
        )}
        {yTicks.map((c) => (
          <g key={`y${c}`}>
            <line x1={M.left} x2={W - M.right} y1={y(c)} y2={y(c)} className="stroke-line" strokeWidth={1} />
            <text x={M.left - 8} y={y(c) + 4} textAnchor="end" className="fill-muted text-[11px]">
              {c}
            </text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={`x${t}`} x={x(t)} y={H - M.bottom + 18} textAnchor="middle" className="fill-muted text-[11px]">
            {Math.round((t - t0) / 60)}
          </text>
        ))}
        <text x={(M.left + W - M.right) / 2} y={H - 6} textAnchor="middle" className="fill-muted text-[11px]">
          minutes from the start of the record
        </text>
        <text x={12} y={M.top + (H - M.top - M.bottom) / 2} transform={`rotate(-90 12 ${M.top + (H - M.top - M.bottom) / 2})`} textAnchor="middle" className="fill-muted text-[11px]">
          °C
        </text>
        {chart.a0LowerLimitC !== chart.thresholdC && (
          <line x1={M.left} x2={W - M.right} y1={y(chart.a0LowerLimitC)} y2={y(chart.a0LowerLimitC)} className="stroke-muted" strokeDasharray="2 4" strokeWidth={1} />
        )}
        <line x1={M.left} x2={W - M.right} y1={y(chart.thresholdC)} y2={y(chart.thresholdC)} className="stroke-ember-600" strokeDasharray="6 4" strokeWidth={1.5} />
        <text x={W - M.right - 4} y={y(chart.thresholdC) - 6} textAnchor="end" className="fill-ember-700 text-[11px] font-semibold">
          {chart.thresholdC} °C {chart.thresholdC === chart.a0LowerLimitC ? "(A0 lower limit)" : "(hold threshold)"}
        </text>
        <line
          x1={x(chart.disinfectionEndS)}
          x2={x(chart.disinfectionEndS)}
          y1={M.top}
          y2={H - M.bottom}
          className="stroke-ink-soft"
          strokeDasharray="3 3"
          strokeWidth={1}
        />
        <text x={x(chart.disinfectionEndS) + 4} y={M.top + 12} className="fill-ink-soft text-[11px]">
          end of disinfection
        </text>
        <polyline points={line} fill="none" className="stroke-lagoon-700" strokeWidth={2} strokeLinejoin="round" />
        <line x1={M.left} x2={M.left} y1={M.top} y2={H - M.bottom} className="stroke-line-strong" strokeWidth={1} />
        <line x1={M.left} x2={W - M.right} y1={H - M.bottom} y2={H - M.bottom} className="stroke-line-strong" strokeWidth={1} />
      </svg>
      <figcaption className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-muted">
        <span>
          <span className="mr-1 inline-block h-0.5 w-5 bg-lagoon-700 align-middle" aria-hidden="true" /> Temperature
        </span>
        <span>
          <span className="mr-1 inline-block h-3 w-5 bg-ok-50 align-middle ring-1 ring-ok-600/30" aria-hidden="true" /> Hold at or above {chart.thresholdC} °C
        </span>
        <span>
          <span className="mr-1 inline-block w-5 border-t-2 border-dashed border-ember-600 align-middle" aria-hidden="true" /> {chart.thresholdC} °C
        </span>
        <span>Drying after the dashed vertical line does not count towards A0.</span>
      </figcaption>
    </figure>
  );
}
