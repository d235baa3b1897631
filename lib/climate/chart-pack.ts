// The chamber chart's points as columns for the page to send: times as differences from the first,
// values rounded to 0.01, the instrument as an index into a list, RH as logged only where it differs
// from the corrected RH. A 30-day chart of 1,600 points packs to about a fifth of its objects' JSON.

export type ChartPoint = { t: number; rh: number; rhRaw: number; tempC: number | null; dewC: number | null; dewOver: "water" | "ice" | "logged" | null; instrument: string };

export type PackedChart = {
  t0: number;
  /** ms since the previous point (the first is 0). */
  dt: number[];
  rh: number[];
  /** RH as logged where it differs from rh (no hygrometer correction: null). */
  rhRaw: (number | null)[] | null;
  tempC: (number | null)[];
  dewC: (number | null)[];
  /** One letter per point: w(ater), i(ce), l(ogged), - (none). */
  dewOver: string;
  instruments: string[];
  instrument: number[];
};

const r2 = (x: number) => Math.round(x * 100) / 100;
const r2n = (x: number | null) => (x === null ? null : r2(x));
const OVER = { water: "w", ice: "i", logged: "l" } as const;
const FROM = { w: "water", i: "ice", l: "logged" } as const;

export function packChart(points: readonly ChartPoint[]): PackedChart {
  const instruments = [...new Set(points.map((p) => p.instrument))];
  const index = new Map(instruments.map((x, i) => [x, i]));
  const corrected = points.some((p) => r2(p.rhRaw) !== r2(p.rh));
  return {
    t0: points[0]?.t ?? 0,
    dt: points.map((p, i) => (i === 0 ? 0 : p.t - points[i - 1].t)),
    rh: points.map((p) => r2(p.rh)),
    rhRaw: corrected ? points.map((p) => (r2(p.rhRaw) === r2(p.rh) ? null : r2(p.rhRaw))) : null,
    tempC: points.map((p) => r2n(p.tempC)),
    dewC: points.map((p) => r2n(p.dewC)),
    dewOver: points.map((p) => (p.dewOver ? OVER[p.dewOver] : "-")).join(""),
    instruments,
    instrument: points.map((p) => index.get(p.instrument)!),
  };
}

export function unpackChart(c: PackedChart): ChartPoint[] {
  let t = c.t0;
  return c.rh.map((rh, i) => {
    t += c.dt[i];
    const over = c.dewOver[i] as keyof typeof FROM | "-";
    return {
      t, rh, rhRaw: c.rhRaw?.[i] ?? rh, tempC: c.tempC[i], dewC: c.dewC[i], dewOver: over === "-" ? null : FROM[over], instrument: c.instruments[c.instrument[i]],
    };
  });
}
