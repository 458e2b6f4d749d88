import type { PlanRunView, PlanStopView } from "@/lib/dispatch/view";

// The day's runs drawn from the sites' coordinates: an equirectangular projection of latitude
// and longitude into the picture (scaled by the cosine of the middle latitude, which keeps
// distances right within a region), no map tiles. Each van has its own line pattern and its
// code at every stop, so the runs read without colour.

const WIDTH = 640;
const HEIGHT = 420;
const PAD = 36;

/** Line patterns per van, in order; colours repeat the difference but never carry it alone. */
export const RUN_STYLES = [
  { dash: "", colour: "#0f5e63", label: "solid line" },
  { dash: "10 6", colour: "#b4531f", label: "long dashes" },
  { dash: "2 5", colour: "#5b4a9e", label: "dotted line" },
  { dash: "12 4 2 4", colour: "#2f6b2a", label: "dash and dot" },
  { dash: "6 3", colour: "#7a2e4d", label: "short dashes" },
] as const;

export function runStyle(index: number) {
  return RUN_STYLES[index % RUN_STYLES.length]!;
}

interface Point {
  x: number;
  y: number;
}

export function RunMap({ runs, unassigned, depot }: { runs: PlanRunView[]; unassigned: PlanStopView[]; depot: { name: string; lat: number; lon: number } | null }) {
  const places = [...runs.flatMap((r) => r.stops), ...unassigned].map((s) => ({ lat: s.lat, lon: s.lon }));
  if (depot) places.push({ lat: depot.lat, lon: depot.lon });
  if (places.length === 0) return null;
  const midLat = (Math.min(...places.map((p) => p.lat)) + Math.max(...places.map((p) => p.lat))) / 2;
  const k = Math.cos((midLat * Math.PI) / 180);
  const xs = places.map((p) => p.lon * k);
  const ys = places.map((p) => p.lat);
  const [minX, maxX, minY, maxY] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const scale = Math.min((WIDTH - 2 * PAD) / Math.max(maxX - minX, 1e-6), (HEIGHT - 2 * PAD) / Math.max(maxY - minY, 1e-6));
  const offX = (WIDTH - (maxX - minX) * scale) / 2;
  const offY = (HEIGHT - (maxY - minY) * scale) / 2;
  const project = (lat: number, lon: number): Point => ({ x: offX + (lon * k - minX) * scale, y: HEIGHT - (offY + (lat - minY) * scale) });
  const home = depot ? project(depot.lat, depot.lon) : null;
  const used = runs.map((r, i) => ({ run: r, style: runStyle(i) })).filter((r) => r.run.stops.length > 0);

  return (
    <figure className="space-y-2">
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-labelledby="run-map-title run-map-desc" className="h-auto w-full rounded-lg border border-line bg-white">
        <title id="run-map-title">Picture of the day&apos;s runs</title>
        <desc id="run-map-desc">
          {used.map(({ run, style }) => `Van ${run.vanCode} (${style.label}): unit, ${run.stops.map((s) => s.siteName).join(", ")}, unit.`).join(" ")}
          {unassigned.length > 0 ? ` Not on a run: ${unassigned.map((s) => s.siteName).join(", ")}.` : ""}
        </desc>
        {used.map(({ run, style }) => {
          const points = [home, ...run.stops.map((s) => project(s.lat, s.lon)), home].filter((p): p is Point => p !== null);
          return (
            <polyline
              key={run.id}
              points={points.map((p) => `${p.x.toFixed(1)},${p.y.toFixed(1)}`).join(" ")}
              fill="none"
              stroke={style.colour}
              strokeWidth={2.5}
              strokeDasharray={style.dash || undefined}
              strokeLinejoin="round"
            />
          );
        })}
        {used.flatMap(({ run, style }) =>
          run.stops.map((s) => {
            const p = project(s.lat, s.lon);
            return (
              <g key={`${run.id}-${s.id}`}>
                <circle cx={p.x} cy={p.y} r={11} fill="white" stroke={style.colour} strokeWidth={2} />
                <text x={p.x} y={p.y + 3.5} textAnchor="middle" fontSize={9} fontWeight={700} fill="#1d2a2f">
                  {run.vanCode}·{s.position}
                </text>
              </g>
            );
          }),
        )}
        {unassigned.map((s) => {
          const p = project(s.lat, s.lon);
          return (
            <g key={`u-${s.id}`}>
              <rect x={p.x - 9} y={p.y - 9} width={18} height={18} fill="white" stroke="#a11d1d" strokeWidth={2} />
              <text x={p.x} y={p.y + 3.5} textAnchor="middle" fontSize={10} fontWeight={700} fill="#a11d1d">
                ?
              </text>
            </g>
          );
        })}
        {home && (
          <g>
            <polygon points={`${home.x},${home.y - 13} ${home.x + 12},${home.y + 9} ${home.x - 12},${home.y + 9}`} fill="#1d2a2f" />
            <text x={home.x} y={home.y + 24} textAnchor="middle" fontSize={10} fill="#1d2a2f">
              Unit
            </text>
          </g>
        )}
      </svg>
      <figcaption className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft">
        {used.map(({ run, style }) => (
          <span key={run.id} className="inline-flex items-center gap-2">
            <svg width="36" height="10" aria-hidden="true">
              <line x1="0" y1="5" x2="36" y2="5" stroke={style.colour} strokeWidth="2.5" strokeDasharray={style.dash || undefined} />
            </svg>
            Van {run.vanCode} ({style.label}); circles read van·stop
          </span>
        ))}
        <span>▲ the unit</span>
        {unassigned.length > 0 && <span>□? not on a run</span>}
        <span>Straight lines between stops, not the roads driven.</span>
      </figcaption>
    </figure>
  );
}
