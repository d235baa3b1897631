import { describe, expect, it } from "vitest";
import { createRng } from "@/lib/allocation/prng";
import {
  intervalLogLik,
  lognormalIntervalRegression,
  weibullIntervalRegression,
  type IntervalRegressionFit,
} from "@/lib/stats/interval-regression";
import type { IntervalRow } from "@/lib/stats/interval-design";
import { lung, ovarian } from "@/tests/support/r-interval-data";

// Every reference value below was computed with R 4.2.2 and survival 3.5-3 (survreg's default
// control: rel.tolerance = 1e-9, maxiter = 30); tests do not call R. R's own estimates are only
// as exact as that tolerance (about 1e-8 relative), hence the 1e-7 tolerance on estimates.

function expectClose(actual: number, expected: number, relative = 1e-7): void {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * Math.max(Math.abs(expected), 1e-300));
}

function expectAllClose(actual: number[], expected: number[], relative = 1e-7): void {
  expect(actual).toHaveLength(expected.length);
  actual.forEach((v, i) => expectClose(v, expected[i], relative));
}

interface Reference {
  coef: number[]; // intercept then covariates, R's coef(fit)
  scale: number; // fit$scale
  se: number[]; // sqrt(diag(vcov(fit))), log(scale) last
  loglik: number; // fit$loglik[2]
  quantiles: { x: number[]; p10: number; p50: number }[]; // predict(fit, newdata, type = "quantile", p = c(0.1, 0.5))
}

function expectFit(fit: IntervalRegressionFit, ref: Reference): void {
  expect(fit.converged).toBe(true);
  expectAllClose([fit.intercept, ...fit.coefficients], ref.coef);
  expectClose(fit.scale, ref.scale);
  expectAllClose(fit.standardErrors, ref.se, 1e-6);
  expectClose(fit.logLik, ref.loglik, 1e-10);
  for (const q of ref.quantiles) {
    expectClose(fit.quantile(0.1, q.x), q.p10);
    expectClose(fit.quantile(0.5, q.x), q.p50);
  }
}

// ovarian as right-censored rows: an event is an exact time, a censored one is (futime, Inf).
const ovarianRows: IntervalRow[] = ovarian.futime.map((t, i) => ({
  lower: t,
  upper: ovarian.fustat[i] === 1 ? t : Infinity,
  x: [ovarian.ecogPs[i], ovarian.rx[i]],
}));

/**
 * lung seen at looks every 60 days, built in R as
 *   L <- 60 * floor(lung$time / 60); R <- ifelse(lung$status == 2, L + 60, Inf); L[L == 0] <- NA
 * (here L = 0 stands for R's NA: rust before the first look). With `exactEveryTenth`, events on rows
 * 10, 20, … keep their exact day:  exact <- lung$status == 2 & seq_len(nrow(lung)) %% 10 == 0;
 * L[exact] <- R[exact] <- lung$time[exact]  (17 rows).
 */
function lungAtLooks(covariates: boolean, exactEveryTenth = false): IntervalRow[] {
  return lung.time.map((t, i) => {
    const x = covariates ? [lung.age[i], lung.sex[i]] : [];
    const event = lung.status[i] === 2;
    if (exactEveryTenth && event && (i + 1) % 10 === 0) return { lower: t, upper: t, x };
    const lower = 60 * Math.floor(t / 60);
    return { lower, upper: event ? lower + 60 : Infinity, x };
  });
}

describe("right-censored data: survival::ovarian", () => {
  it("Weibull matches survreg", () => {
    // R: survreg(Surv(futime, fustat) ~ ecog.ps + rx, data = ovarian, dist = "weibull")
    //    predict(fit, data.frame(ecog.ps = c(1, 2), rx = c(1, 2)), type = "quantile", p = c(0.1, 0.5))
    const fit = weibullIntervalRegression(ovarianRows);
    expect(fit.distribution).toBe("weibull");
    expect(fit.n).toBe(26);
    expectFit(fit, {
      coef: [6.896693128582805, -0.385042549349846, 0.528645496261251],
      scale: 0.883873071703135,
      se: [1.177547215554515, 0.527001781436021, 0.529201901037738, 0.252213104377743],
      loglik: -97.0844931683874,
      quantiles: [
        { x: [1, 1], p10: 156.218707013033, p50: 825.79385698651 },
        { x: [2, 2], p10: 180.342882267738, p50: 953.317609494196 },
      ],
    });
  });

  it("lognormal matches survreg", () => {
    // R: survreg(Surv(futime, fustat) ~ ecog.ps + rx, data = ovarian, dist = "lognormal")
    //    predict(fit, data.frame(ecog.ps = c(1, 2), rx = c(1, 2)), type = "quantile", p = c(0.1, 0.5))
    expectFit(lognormalIntervalRegression(ovarianRows), {
      coef: [5.878440349975043, -0.229274996182328, 0.813359148397217],
      scale: 1.18135264387767,
      se: [1.093970404381505, 0.537364600545414, 0.537201484527473, 0.227979224552623],
      loglik: -95.9473633595646,
      quantiles: [
        { x: [1, 1], p10: 140.971842516079, p50: 640.676405724703 },
        { x: [2, 2], p10: 252.811543594508, p50: 1148.955622519929 },
      ],
    });
  });
});

describe("interval-censored data: survival::lung seen every 60 days", () => {
  const lungQuantileRows = (q: [number, number, number, number]) => [
    { x: [60, 1], p10: q[0], p50: q[1] },
    { x: [70, 2], p10: q[2], p50: q[3] },
  ];

  it("Weibull matches survreg, with R's full covariance matrix", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d1, dist = "weibull")
    //    predict(fit, data.frame(age = c(60, 70), sex = c(1, 2)), type = "quantile", p = c(0.1, 0.5))
    const fit = weibullIntervalRegression(lungAtLooks(true));
    expect(fit.n).toBe(228);
    expectFit(fit, {
      coef: [6.232018453847501, -0.0114876105671385, 0.3631017662124718],
      scale: 0.723424931494843,
      se: [0.4609812855851364, 0.00668399309168808, 0.12247073779491285, 0.06310456388052373],
      loglik: -465.31958544522,
      quantiles: lungQuantileRows([72.0882999948136, 281.665163381549, 92.3991165055341, 361.0240808663054]),
    });
    // R: vcov(fit)
    const vcov = [
      [2.12503745659725e-1, -2.85832709357125e-3, -2.15683656279074e-2, 7.51233240158884e-4],
      [-2.85832709357125e-3, 4.46757636497339e-5, 2.60905541090288e-5, -4.25082772017592e-5],
      [-2.15683656279074e-2, 2.60905541090288e-5, 1.49990816160303e-2, 1.23847059306906e-3],
      [7.51233240158884e-4, -4.25082772017592e-5, 1.23847059306906e-3, 3.9821859825511e-3],
    ];
    fit.covariance.forEach((row, i) => expectAllClose(row, vcov[i], 1e-6));
    fit.covariance.forEach((row, i) => row.forEach((v, j) => expect(v).toBe(fit.covariance[j][i])));
  });

  it("lognormal matches survreg", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d1, dist = "lognormal")
    //    predict(fit, data.frame(age = c(60, 70), sex = c(1, 2)), type = "quantile", p = c(0.1, 0.5))
    expectFit(lognormalIntervalRegression(lungAtLooks(true)), {
      coef: [6.1153478536448223, -0.0177660314804437, 0.4716134676763895],
      scale: 0.873796777901773,
      se: [0.49903164793025379, 0.00709835198202694, 0.13103812277829902, 0.06063805075651743],
      loglik: -466.40469070352,
      quantiles: lungQuantileRows([81.5473476081593, 249.8846552750839, 109.4137925653484, 335.2755011592311]),
    });
  });

  it("exact rows add the density term and the Jacobian −Σ log t (Weibull)", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d2, dist = "weibull"), d2 with the 17 exact rows
    expectFit(weibullIntervalRegression(lungAtLooks(true, true)), {
      coef: [6.2380301495816006, -0.0115860511067347, 0.3641420987856535],
      scale: 0.724224914384959,
      se: [0.46174465950977689, 0.00669794880793641, 0.12257953561951004, 0.06304240986067905],
      loglik: -535.228416168588,
      quantiles: lungQuantileRows([72.0411221540528, 281.9053548298371, 92.3438107329751, 361.3521548894165]),
    });
  });

  it("exact rows add the density term and the Jacobian −Σ log t (lognormal)", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d2, dist = "lognormal")
    expectFit(lognormalIntervalRegression(lungAtLooks(true, true)), {
      coef: [6.1529267960573657, -0.0186364002728488, 0.484704412739925],
      scale: 0.893432844694234,
      se: [0.5099457811126762, 0.0072513548690162, 0.1338674457961358, 0.0601489697663156],
      loglik: -538.14501447965,
      quantiles: lungQuantileRows([79.3975039689387, 249.4970751872236, 106.9977002896603, 336.2273615613036]),
    });
  });

  it("fits an intercept and a scale when there are no covariates", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ 1, data = d1, dist = "weibull")
    const weibull = weibullIntervalRegression(lungAtLooks(false));
    expect(weibull.coefficients).toEqual([]);
    expectFit(weibull, {
      coef: [6.01342462662414],
      scale: 0.727231324783659,
      se: [0.0567764864306715, 0.0636323787042386],
      loglik: -471.880000782178,
      quantiles: [{ x: [], p10: 79.5898851608726, p50: 313.2134634176699 }],
    });
    // R: survreg(Surv(L, R, type = "interval2") ~ 1, data = d1, dist = "lognormal")
    expectFit(lognormalIntervalRegression(lungAtLooks(false)), {
      coef: [5.65333790644763],
      scale: 0.908338442385708,
      se: [0.0650189637243927, 0.0608297843961931],
      loglik: -477.080392451202,
      quantiles: [{ x: [], p10: 89.055106614317, p50: 285.241989637953 }],
    });
  });
});

describe("log-likelihood at given parameters", () => {
  it("matches survreg's loglik at fixed coefficients and scale", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ age + sex, data = d1, dist = "weibull", init = c(6, -0.01, 0.3),
    //            scale = 0.8, control = survreg.control(maxiter = 0))$loglik[2]
    const params = { intercept: 6, coefficients: [-0.01, 0.3], scale: 0.8 };
    expectClose(intervalLogLik(lungAtLooks(true), "weibull", params), -473.514930323709, 1e-12);
    // R: the same call with dist = "lognormal"
    expectClose(intervalLogLik(lungAtLooks(true), "lognormal", params), -472.524405567293, 1e-12);
  });

  it("gives the fit's own loglik at the fitted parameters, and less anywhere near them", () => {
    const rows = lungAtLooks(true, true);
    for (const [distribution, fitter] of [["weibull", weibullIntervalRegression], ["lognormal", lognormalIntervalRegression]] as const) {
      const fit = fitter(rows);
      const at = (intercept: number, coefficients: number[], scale: number) => intervalLogLik(rows, distribution, { intercept, coefficients, scale });
      expectClose(at(fit.intercept, fit.coefficients, fit.scale), fit.logLik, 1e-12);
      const se = fit.standardErrors;
      for (const sign of [-1, 1]) {
        expect(at(fit.intercept + sign * se[0], fit.coefficients, fit.scale)).toBeLessThan(fit.logLik);
        expect(at(fit.intercept, [fit.coefficients[0] + sign * se[1], fit.coefficients[1]], fit.scale)).toBeLessThan(fit.logLik);
        expect(at(fit.intercept, fit.coefficients, fit.scale * Math.exp(sign * se[3]))).toBeLessThan(fit.logLik);
      }
    }
  });
});

describe("only left- and right-censored rows (one look per specimen)", () => {
  // Hand-made: 16 specimens, each looked at once on `look`; rusted → (0, look], not rusted → (look, Inf).
  // In R: look <- c(10, 15, 20, 25, 30, 35, 40, 50, 10, 20, 30, 40, 50, 60, 70, 80)
  //       rusted <- c(0, 1, 0, 1, 1, 0, 1, 1, 0, 0, 0, 1, 0, 1, 0, 1); coated <- rep(c(0, 1), each = 8)
  //       L <- ifelse(rusted == 1, NA, look); R <- ifelse(rusted == 1, look, Inf)
  const look = [10, 15, 20, 25, 30, 35, 40, 50, 10, 20, 30, 40, 50, 60, 70, 80];
  const rusted = [0, 1, 0, 1, 1, 0, 1, 1, 0, 0, 0, 1, 0, 1, 0, 1];
  const rows: IntervalRow[] = look.map((day, i) => ({
    lower: rusted[i] ? 0 : day,
    upper: rusted[i] ? day : Infinity,
    x: [i < 8 ? 0 : 1],
  }));

  it("Weibull matches survreg", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ coated, dist = "weibull")
    //    predict(fit, data.frame(coated = c(0, 1)), type = "quantile", p = c(0.1, 0.5))
    expectFit(weibullIntervalRegression(rows), {
      coef: [3.26724051598131, 1.00175674749879],
      scale: 0.648206044197037,
      se: [0.32525085831177, 0.554291967765597, 0.604398179426842],
      loglik: -8.66483480433688,
      quantiles: [
        { x: [0], p10: 6.10152544430927, p50: 20.69029243093714 },
        { x: [1], p10: 16.61482817597008, p50: 56.34093585092169 },
      ],
    });
  });

  it("lognormal matches survreg", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ coated, dist = "lognormal")
    expectFit(lognormalIntervalRegression(rows), {
      coef: [2.95747419514444, 1.04281883613494],
      scale: 0.729452630677378,
      se: [0.378152291912329, 0.550226218950836, 0.575986179685176],
      loglik: -8.53827027956578,
      quantiles: [
        { x: [0], p10: 7.55827533828371, p50: 19.2492903504858 },
        { x: [1], p10: 21.44436421825769, p50: 54.61415134322748 },
      ],
    });
  });

  it("leaves out a row from 0 to Infinity, as R drops it as missing", () => {
    const withEmpty = [...rows, { lower: 0, upper: Infinity, x: [1] }];
    const fit = weibullIntervalRegression(withEmpty);
    expect(fit.n).toBe(16);
    expectClose(fit.logLik, -8.66483480433688, 1e-10); // R: as the Weibull fit above
  });
});

describe("bad input", () => {
  const good: IntervalRow[] = [
    { lower: 0, upper: 10, x: [1] },
    { lower: 10, upper: 20, x: [2] },
    { lower: 20, upper: Infinity, x: [3] },
  ];
  const fits = [weibullIntervalRegression, lognormalIntervalRegression];

  it("names what is wrong with the rows", () => {
    const cases: [IntervalRow[], RegExp][] = [
      [[], /no rows to fit/],
      [[...good, { lower: 5, upper: 9, x: [1, 2] }], /Row 4 has 2 covariates but row 1 has 1/],
      [[...good, { lower: 5, upper: 9 } as unknown as IntervalRow], /Row 4 has no list of covariates \(x\); give x: \[\] when there are none/],
      [[...good, { lower: 30, upper: 20, x: [1] }], /Row 4: the lower time 30 is above the upper time 20/],
      [[...good, { lower: -1, upper: 20, x: [1] }], /Row 4: the lower time must be a finite number of 0 or more, got -1/],
      [[...good, { lower: Number.NaN, upper: 20, x: [1] }], /Row 4: the lower time must be a finite number of 0 or more, got not a number/],
      [[...good, { lower: Infinity, upper: Infinity, x: [1] }], /Row 4: the lower time must be a finite number/],
      [[...good, { lower: 0, upper: 0, x: [1] }], /Row 4: the upper time must be above 0/],
      [[...good, { lower: 0, upper: -3, x: [1] }], /Row 4: the upper time must be above 0/],
      [[...good, { lower: 5, upper: 9, x: [Number.NaN] }], /Row 4: covariate 1 must be a finite number/],
      [good.map((r) => ({ ...r, lower: r.lower + 1, upper: Infinity })), /Every row is right-censored/],
      [good.map((r) => ({ ...r, lower: 0, upper: r.lower + 5 })), /Every row is left-censored/],
      [[{ lower: 0, upper: Infinity, x: [1] }], /no row says anything about the time/],
      [good.map((r) => ({ ...r, x: [7] })), /Covariate 1 has the same value in every row/],
      [good.map((r) => ({ ...r, x: [r.x[0], 2 * r.x[0] + 1] })), /Covariate 2 is a copy of another covariate/],
    ];
    for (const fit of fits) {
      for (const [rows, message] of cases) expect(() => fit(rows)).toThrow(message);
      for (const [rows] of cases) expect(() => fit(rows)).toThrow(RangeError);
    }
  });

  it("refuses a covariate whose effect drifts off without end instead of returning it", () => {
    // R: survreg(Surv(L, R, type = "interval2") ~ g, dist = "weibull") on these rows "converges"
    // with coefficient 14.68 and standard error 1.58e4 (group g = 1 never rusted).
    const separated: IntervalRow[] = [
      { lower: 10, upper: 20, x: [0] },
      { lower: 20, upper: 30, x: [0] },
      { lower: 0, upper: 10, x: [0] },
      { lower: 30, upper: Infinity, x: [0] },
      { lower: 30, upper: Infinity, x: [1] },
      { lower: 30, upper: Infinity, x: [1] },
      { lower: 30, upper: Infinity, x: [1] },
    ];
    for (const fit of fits) expect(() => fit(separated)).toThrow(/cannot pin down the effect of covariate 1/);
  });

  it("says so when the iterations do not settle", () => {
    // Every time fits one line exactly (rust after 10 days at x = 1, 12–18 at 2.5, …), so the
    // likelihood keeps rising as σ → 0. R: survreg(Surv(L, R, type = "interval2") ~ x, dist = "weibull")
    // on L = c(NA, 10, 20, 12), R = c(10, 20, Inf, 18), x = c(1, 2, 3, 2.5) warns "Ran out of iterations
    // and did not converge" after 30 iterations with scale 0.047 (lognormal: the same, scale 0.0085).
    const onALine = good.concat({ lower: 12, upper: 18, x: [2.5] });
    // Which of the two refusals comes first depends on rounding (the loglik may reach 0 exactly).
    for (const fit of fits) expect(() => fit(onALine)).toThrow(/did not converge( within 30 iterations|: a straight line)/);
  });

  it("checks the arguments of quantile and never returns NaN", () => {
    const fit = weibullIntervalRegression(ovarianRows.map((r) => ({ ...r, x: [r.x[0]] })));
    expect(() => fit.quantile(0, [1])).toThrow(/between 0 and 1/);
    expect(() => fit.quantile(1, [1])).toThrow(/between 0 and 1/);
    expect(() => fit.quantile(Number.NaN, [1])).toThrow(/between 0 and 1/);
    expect(() => fit.quantile(0.5, [])).toThrow(/needs 1 covariates, got 0/);
    expect(() => fit.quantile(0.5, [Infinity])).toThrow(/finite covariate/);
    const values = [fit.intercept, ...fit.coefficients, fit.scale, fit.logLik, ...fit.standardErrors, ...fit.covariance.flat()];
    expect(values.every(Number.isFinite)).toBe(true);
  });
});

describe("odd data never give NaN", () => {
  it("either fits with finite numbers at a maximum or refuses with a RangeError", () => {
    // Seeded random small data sets: few rows, ties, exact rows, far outliers, one or two covariates.
    // When this was written, 9 of the 300 fits for this seed were refused; R 4.2.2, survival 3.5-3 survreg on those data sets
    // either warns "Ran out of iterations and did not converge" or returns a coefficient with a
    // standard error above 2,000 (a group that never or always rusted), checked once by hand.
    const rng = createRng("interval-regression-odd-data");
    let fitted = 0;
    let refused = 0;
    for (let set = 0; set < 150; set++) {
      const n = 3 + Math.floor(rng() * 30);
      const k = Math.floor(rng() * 3);
      const rows: IntervalRow[] = [];
      for (let i = 0; i < n; i++) {
        const x = Array.from({ length: k }, (_, j) => (j === 0 ? (rng() < 0.5 ? 0 : 1) : 50 * rng()));
        const outlier = rng() < 0.05 ? (rng() < 0.5 ? 1e-4 : 1e5) : 1;
        const t = outlier * Math.exp(3 + (x[0] ?? 0) * 0.5 + rng() * 2 - 1);
        const look = 5 + Math.floor(rng() * 10);
        const r = rng();
        if (r < 0.1) rows.push({ lower: t, upper: t, x });
        else if (t > 60) rows.push({ lower: 60, upper: Infinity, x });
        else {
          const seen = Math.ceil(t / look) * look;
          rows.push({ lower: seen - look, upper: seen, x });
        }
      }
      for (const [distribution, fitter] of [["weibull", weibullIntervalRegression], ["lognormal", lognormalIntervalRegression]] as const) {
        let fit: IntervalRegressionFit;
        try {
          fit = fitter(rows);
        } catch (error) {
          expect(error).toBeInstanceOf(RangeError);
          refused++;
          continue;
        }
        fitted++;
        const numbers = [fit.intercept, ...fit.coefficients, fit.scale, fit.logLik, ...fit.standardErrors, ...fit.covariance.flat()];
        expect(numbers.every(Number.isFinite)).toBe(true);
        const xMean = Array.from({ length: k }, (_, j) => rows.reduce((s, row) => s + row.x[j], 0) / rows.length);
        for (const p of [0.01, 0.5, 0.99]) expect(Number.isNaN(fit.quantile(p, xMean))).toBe(false);
        const nudged = intervalLogLik(rows, distribution, { intercept: fit.intercept + 0.01, coefficients: fit.coefficients, scale: fit.scale });
        expect(nudged).toBeLessThanOrEqual(fit.logLik + 1e-9 * Math.abs(fit.logLik));
      }
    }
    expect(fitted).toBeGreaterThan(100);
    expect(refused).toBeGreaterThan(0);
  });
});

