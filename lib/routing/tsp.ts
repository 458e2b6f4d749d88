// Plain symmetric travelling-salesman tours: iterated local search with 2-opt and Or-opt moves
// on nearest-neighbour candidate lists, perturbed by segment swaps (a local double bridge).
// The same seed and `maxIterations` give the same tour; a time budget alone depends on the machine.
import { RoutingInputError } from "./errors";
import { mulberry32, randomInt } from "./random";

export interface TspOptions {
  seed?: number;
  /** Perturbation rounds; alone it makes the result reproducible. */
  maxIterations?: number;
  /** Wall-clock limit. Default 1000 ms unless `maxIterations` is given. */
  timeBudgetMs?: number;
}

export interface TspResult {
  /** Indices into `points`, starting with 0; the tour returns to it. */
  tour: number[];
  length: number;
  iterations: number;
}

const GAIN_EPS = 1e-9;
const NEIGHBOURS = 10;

class Tour {
  readonly tour: Int32Array;
  readonly pos: Int32Array;
  private readonly buf: Int32Array;
  readonly queue: number[] = [];
  readonly queued: Uint8Array;

  constructor(
    readonly n: number,
    readonly d: Float64Array,
    readonly neigh: Int32Array[],
    start: number[],
  ) {
    this.tour = Int32Array.from(start);
    this.pos = new Int32Array(n);
    this.buf = new Int32Array(n);
    this.queued = new Uint8Array(n);
    this.reindex();
  }

  reindex(): void {
    for (let i = 0; i < this.n; i++) this.pos[this.tour[i]] = i;
  }

  dist(a: number, b: number): number {
    return this.d[a * this.n + b];
  }

  succ(c: number): number {
    const p = this.pos[c] + 1;
    return this.tour[p === this.n ? 0 : p];
  }

  pred(c: number): number {
    const p = this.pos[c] - 1;
    return this.tour[p < 0 ? this.n - 1 : p];
  }

  length(): number {
    let total = 0;
    for (let i = 0; i < this.n; i++) total += this.dist(this.tour[i], this.tour[(i + 1) % this.n]);
    return total;
  }

  push(...cities: number[]): void {
    for (const c of cities) {
      if (!this.queued[c]) {
        this.queued[c] = 1;
        this.queue.push(c);
      }
    }
  }

  // Reverses the path from position i forward to position j, or the rest of the cycle if shorter.
  private reverse(i: number, j: number): void {
    const n = this.n;
    let len = j - i;
    if (len < 0) len += n;
    len += 1;
    if (len * 2 > n) {
      const ni = j + 1;
      const nj = i - 1;
      i = ni === n ? 0 : ni;
      j = nj < 0 ? n - 1 : nj;
      len = n - len;
    }
    for (let k = 0; k < len >> 1; k++) {
      const a = this.tour[i];
      const b = this.tour[j];
      this.tour[i] = b;
      this.pos[b] = i;
      this.tour[j] = a;
      this.pos[a] = j;
      i = i + 1 === n ? 0 : i + 1;
      j = j - 1 < 0 ? n - 1 : j - 1;
    }
  }

  private twoOpt(a: number): boolean {
    for (let dir = 0; dir < 2; dir++) {
      const b = dir === 0 ? this.succ(a) : this.pred(a);
      const dab = this.dist(a, b);
      for (const c of this.neigh[a]) {
        const g1 = dab - this.dist(a, c);
        if (g1 <= GAIN_EPS) break;
        const d = dir === 0 ? this.succ(c) : this.pred(c);
        if (c === b || d === a) continue;
        const gain = g1 + this.dist(c, d) - this.dist(b, d);
        if (gain > GAIN_EPS) {
          if (dir === 0) this.reverse(this.pos[b], this.pos[c]);
          else this.reverse(this.pos[a], this.pos[d]);
          this.push(a, b, c, d);
          return true;
        }
      }
    }
    return false;
  }

  // Moves a segment of 1–3 cities starting at a between two neighbouring cities elsewhere.
  private orOpt(a: number): boolean {
    const n = this.n;
    for (let L = 1; L <= 3 && L < n - 2; L++) {
      const i = this.pos[a];
      const sL = this.tour[(i + L - 1) % n];
      const p = this.pred(a);
      const nx = this.succ(sL);
      const removeGain = this.dist(p, a) + this.dist(sL, nx) - this.dist(p, nx);
      if (removeGain <= GAIN_EPS) continue;
      const inSeg = (c: number) => {
        let k = this.pos[c] - i;
        if (k < 0) k += n;
        return k < L;
      };
      for (const e of L === 1 ? [a] : [a, sL]) {
        for (const c of this.neigh[e]) {
          if (this.dist(e, c) >= removeGain) break;
          if (inSeg(c)) continue;
          for (let side = 0; side < 2; side++) {
            const x = side === 0 ? c : this.pred(c);
            const y = side === 0 ? this.succ(c) : c;
            if (inSeg(x) || inSeg(y)) continue;
            const keep = this.dist(x, a) + this.dist(sL, y);
            const flip = this.dist(x, sL) + this.dist(a, y);
            const add = Math.min(keep, flip) - this.dist(x, y);
            if (removeGain - add > GAIN_EPS) {
              this.moveSegment(i, L, x, flip < keep);
              this.push(p, nx, a, sL, x, y);
              return true;
            }
          }
        }
      }
    }
    return false;
  }

  // Takes the L cities from position i out and puts them right after city x (reversed if asked).
  private moveSegment(i: number, L: number, x: number, reversed: boolean): void {
    const n = this.n;
    let w = 0;
    const seg: number[] = [];
    for (let k = 0; k < L; k++) seg.push(this.tour[(i + k) % n]);
    if (reversed) seg.reverse();
    for (let k = L; k < n; k++) {
      const c = this.tour[(i + k) % n];
      this.buf[w++] = c;
      if (c === x) for (const s of seg) this.buf[w++] = s;
    }
    this.tour.set(this.buf);
    this.reindex();
  }

  localSearch(): void {
    while (this.queue.length > 0) {
      const a = this.queue.pop()!;
      this.queued[a] = 0;
      if (this.twoOpt(a) || this.orOpt(a)) this.push(a);
    }
  }

  // Swaps two neighbouring segments (a double bridge kept local), marking the new edges' ends.
  perturb(rand: () => number): void {
    const n = this.n;
    const maxLen = Math.max(1, Math.min(30, Math.floor(n / 4)));
    const l1 = 1 + randomInt(rand, maxLen);
    const l2 = 1 + randomInt(rand, maxLen);
    const i = randomInt(rand, n);
    const at = (k: number) => this.tour[(i + k) % n];
    const before = at(n - 1);
    const a0 = at(0);
    const a1 = at(l1 - 1);
    const b0 = at(l1);
    const b1 = at(l1 + l2 - 1);
    const after = at(l1 + l2);
    let w = 0;
    for (let k = l1; k < l1 + l2; k++) this.buf[w++] = at(k);
    for (let k = 0; k < l1; k++) this.buf[w++] = at(k);
    for (let k = l1 + l2; k < n; k++) this.buf[w++] = at(k);
    this.tour.set(this.buf);
    this.reindex();
    this.push(before, a0, a1, b0, b1, after);
  }
}

// A short closed tour through all points (symmetric distances).
export function solveTsp<P>(points: readonly P[], distance: (a: P, b: P) => number, options: TspOptions = {}): TspResult {
  const n = points.length;
  if (n === 0) return { tour: [], length: 0, iterations: 0 };
  const d = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const x = distance(points[i], points[j]);
      const y = distance(points[j], points[i]);
      if (!Number.isFinite(x) || x < 0) throw new RoutingInputError([`distance from point ${i} to ${j} is ${x}; it must be finite and ≥ 0`]);
      if (Math.abs(x - y) > 1e-9 * Math.max(1, x)) throw new RoutingInputError([`distance from point ${i} to ${j} (${x}) differs from the way back (${y}); solveTsp needs symmetric distances, use solve() for one-way legs`]);
      d[i * n + j] = x;
      d[j * n + i] = x;
    }
  }
  if (n <= 3) {
    const tour = Array.from({ length: n }, (_, i) => i);
    let length = 0;
    for (let i = 0; i < n; i++) length += d[tour[i] * n + tour[(i + 1) % n]];
    return { tour, length, iterations: 0 };
  }
  const k = Math.min(NEIGHBOURS, n - 1);
  const neigh = Array.from({ length: n }, (_, i) => {
    const others = Array.from({ length: n }, (_, j) => j).filter((j) => j !== i);
    others.sort((a, b) => d[i * n + a] - d[i * n + b] || a - b);
    return Int32Array.from(others.slice(0, k));
  });
  // Nearest-neighbour start from point 0.
  const seen = new Uint8Array(n);
  const start = [0];
  seen[0] = 1;
  for (let step = 1; step < n; step++) {
    const last = start[start.length - 1];
    let best = -1;
    for (let j = 0; j < n; j++) if (!seen[j] && (best < 0 || d[last * n + j] < d[last * n + best])) best = j;
    start.push(best);
    seen[best] = 1;
  }
  const t = new Tour(n, d, neigh, start);
  for (let i = 0; i < n; i++) t.push(i);
  t.localSearch();

  const rand = mulberry32(options.seed ?? 1);
  const maxIterations = options.maxIterations ?? Infinity;
  const budgetMs = options.timeBudgetMs ?? (options.maxIterations === undefined ? 1000 : Infinity);
  const deadline = performance.now() + budgetMs;
  let bestLen = t.length();
  const bestTour = Int32Array.from(t.tour);
  let iterations = 0;
  while (iterations < maxIterations && (!Number.isFinite(budgetMs) || performance.now() < deadline)) {
    iterations++;
    t.perturb(rand);
    t.localSearch();
    const len = t.length();
    if (len < bestLen - GAIN_EPS) {
      bestLen = len;
      bestTour.set(t.tour);
    } else if (len > bestLen + GAIN_EPS) {
      t.tour.set(bestTour);
      t.reindex();
    }
  }
  const zero = bestTour.indexOf(0);
  const tour = Array.from({ length: n }, (_, i) => bestTour[(zero + i) % n]);
  return { tour, length: bestLen, iterations };
}
