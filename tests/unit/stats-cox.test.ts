import { describe, expect, it } from "vitest";
import { coxRegression, type CoxRow, type Test } from "@/lib/stats/cox";
import { logRank } from "@/lib/stats/survival";
import { createRng, shuffled } from "@/lib/allocation/prng";
import { heart, lung, ovarian, veteran } from "@/tests/support/r-survival-data";

// Every reference below is from R 4.2.2 with survival 3.5-3 (coef(fit), sqrt(diag(vcov(fit))),
// summary(fit)$conf.int, fit$loglik, 2 * diff(fit$loglik), fit$wald.test, fit$score, fit$iter),
// printed with sprintf("%.12g").
interface Reference {
  coefficients: number[];
  standardErrors: number[];
  lower95: number[];
  upper95: number[];
  logLik: [number, number]; // fit$loglik: at β = 0, at the estimate
  likelihoodRatio: [number, number]; // statistic, p
  wald: [number, number];
  score: [number, number];
  iterations: number;
  n: number;
  events: number;
}

function expectClose(actual: number, expected: number, relative: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * Math.abs(expected));
}

function expectTest(actual: Test, [chiSquare, p]: [number, number], df: number): void {
  expectClose(actual.chiSquare, chiSquare, 1e-6);
  expectClose(actual.pValue, p, 1e-5);
  expect(actual.df).toBe(df);
}

function expectFit(rows: CoxRow[], ties: "efron" | "breslow", ref: Reference): void {
  const fit = coxRegression(rows, { ties });
  const p = ref.coefficients.length;
  ref.coefficients.forEach((b, k) => expectClose(fit.coefficients[k], b, 1e-6));
  ref.standardErrors.forEach((se, k) => expectClose(fit.standardErrors[k], se, 1e-6));
  ref.coefficients.forEach((b, k) => expectClose(fit.hazardRatios[k], Math.exp(b), 1e-6));
  ref.lower95.forEach((v, k) => expectClose(fit.lower95[k], v, 1e-6));
  ref.upper95.forEach((v, k) => expectClose(fit.upper95[k], v, 1e-6));
  expectClose(fit.nullLogLik, ref.logLik[0], 1e-9);
  expectClose(fit.logLik, ref.logLik[1], 1e-9);
  expectTest(fit.likelihoodRatio, ref.likelihoodRatio, p);
  expectTest(fit.wald, ref.wald, p);
  expectTest(fit.score, ref.score, p);
  ref.standardErrors.forEach((se, k) => expectClose(fit.covariance[k][k], se * se, 1e-6));
  expect(fit.iterations).toBe(ref.iterations);
  expect(fit.converged).toBe(true);
  expect(fit.n).toBe(ref.n);
  expect(fit.events).toBe(ref.events);
}

const lungRows: CoxRow[] = lung.time.map((time, i) => ({ time, event: lung.status[i] === 2, x: [lung.age[i], lung.sex[i]] }));
const ovarianRows: CoxRow[] = ovarian.futime.map((time, i) => ({
  time,
  event: ovarian.fustat[i] === 1,
  x: [ovarian.age[i], ovarian.ecogPs[i]],
}));
const veteranRows: CoxRow[] = veteran.time.map((time, i) => ({
  time,
  event: veteran.status[i] === 1,
  x: [veteran.karno[i], veteran.age[i]],
  stratum: veteran.celltype[i],
}));
const heartRows: CoxRow[] = heart.stop.map((time, i) => ({
  time,
  entry: heart.start[i],
  event: heart.event[i] === 1,
  x: [heart.age[i], heart.year[i], heart.surgery[i], heart.transplant[i]],
}));

describe("coxRegression against R survival", () => {
  it("lung, age + sex, Efron ties", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(time, status) ~ age + sex, data = lung)
    expectFit(lungRows, "efron", {
      coefficients: [0.0170453318454, -0.513218517108],
      standardErrors: [0.00922327347697, 0.167457962356],
      lower95: [0.99896858029, 0.431093578804],
      upper95: [1.0357466998, 0.831098514374],
      logLik: [-749.90980139, -742.848245784],
      likelihoodRatio: [14.1231112132, 0.000857443211628],
      wald: [13.4732494514, 0.00118664565941],
      score: [13.7223214895, 0.00104769711762],
      iterations: 3,
      n: 228,
      events: 165,
    });
  });

  it("lung, age + sex, Breslow ties", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(time, status) ~ age + sex, data = lung, ties = "breslow")
    expectFit(lungRows, "breslow", {
      coefficients: [0.0170128891984, -0.512564791519],
      standardErrors: [0.0092219536849, 0.167462063142],
      lower95: [0.998938755627, 0.431372020723],
      upper95: [1.03571041886, 0.831648686628],
      logLik: [-750.122018895, -743.079654198],
      likelihoodRatio: [14.0847293946, 0.000874057235754],
      wald: [13.4374375054, 0.00120808507852],
      score: [13.6852993783, 0.00106727171145],
      iterations: 3,
      n: 228,
      events: 165,
    });
  });

  it("is Efron by default and gives R's covariance off the diagonal", () => {
    const fit = coxRegression(lungRows);
    expectClose(fit.coefficients[1], -0.513218517108, 1e-6); // R: coxph(Surv(time, status) ~ age + sex, data = lung)
    expectClose(fit.covariance[0][1], 8.510633932e-5, 1e-6); // R: vcov(coxph(Surv(time, status) ~ age + sex, data = lung))[1, 2]
    expect(fit.covariance[1][0]).toBe(fit.covariance[0][1]);
  });

  it("ovarian, age + ecog.ps (no tied event times)", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(futime, fustat) ~ age + ecog.ps, data = ovarian)
    expectFit(ovarianRows, "efron", {
      coefficients: [0.161501220365, 0.0186618602333],
      standardErrors: [0.049922587261, 0.599084587762],
      lower95: [1.06572439103, 0.314893007849],
      upper95: [1.29608436649, 3.29644981568],
      logLik: [-34.9849403712, -27.837661696],
      likelihoodRatio: [14.2945573503, 0.000787002860276],
      wald: [10.5423353818, 0.00513760793119],
      score: [12.2605579149, 0.00217597387192],
      iterations: 5,
      n: 26,
      events: 12,
    });
  });

  it("veteran, karno + age with strata(celltype), Efron", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(time, status) ~ karno + age + strata(celltype), data = veteran)
    expectFit(veteranRows, "efron", {
      coefficients: [-0.0368124735751, -0.00859927130076],
      standardErrors: [0.00572323599506, 0.00948780030362],
      lower95: [0.953105374582, 0.973171436887],
      upper95: [0.974729641554, 1.01004660726],
      logLik: [-338.736207226, -317.846081542],
      likelihoodRatio: [41.7802513681, 8.46318216967e-10],
      wald: [41.7743846124, 8.48804432802e-10],
      score: [44.4672572769, 2.20829846024e-10],
      iterations: 4,
      n: 137,
      events: 128,
    });
  });

  it("veteran, karno + age with strata(celltype), Breslow", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(time, status) ~ karno + age + strata(celltype), data = veteran, ties = "breslow")
    expectFit(veteranRows, "breslow", {
      coefficients: [-0.0365611653102, -0.00853777235546],
      standardErrors: [0.00571378994339, 0.00948617244619],
      lower95: [0.953362578256, 0.973234392884],
      upper95: [0.974956579516, 1.01010550318],
      logLik: [-339.141598423, -318.471568821],
      likelihoodRatio: [41.3400592052, 1.05467876702e-9],
      wald: [41.3241203115, 1.063117555e-9],
      score: [43.9699764964, 2.83165878131e-10],
      iterations: 4,
      n: 137,
      events: 128,
    });
  });

  it("heart, delayed entry (start, stop] with several rows per patient, Efron", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(start, stop, event) ~ age + year + surgery + transplant, data = heart)
    expectFit(heartRows, "efron", {
      coefficients: [0.0271666409577, -0.146346345674, -0.637209889967, -0.0102507724091],
      standardErrors: [0.0137141152103, 0.0704679795189, 0.36722599618, 0.313754798337],
      lower95: [1.00028751039, 0.752419663449, 0.257442311582, 0.535154987848],
      upper95: [1.05553295802, 0.991802143454, 1.08604193694, 1.83069803188],
      logLik: [-298.121355673, -290.565616218],
      likelihoodRatio: [15.111478909, 0.00447550038546],
      wald: [14.4930452068, 0.00587686986603],
      score: [15.034197913, 0.00463081142841],
      iterations: 4,
      n: 172,
      events: 75,
    });
  });

  it("heart, delayed entry, Breslow", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(start, stop, event) ~ age + year + surgery + transplant, data = heart, ties = "breslow")
    expectFit(heartRows, "breslow", {
      coefficients: [0.0271520807645, -0.146115750003, -0.635843475598, -0.0118958509638],
      standardErrors: [0.0137211312396, 0.0704657060509, 0.367210695737, 0.313644376741],
      lower95: [1.00025919129, 0.752596541672, 0.257802055833, 0.534390981237],
      upper95: [1.05553210406, 0.992026454711, 1.08749432196, 1.82729335572],
      logLik: [-298.325606736, -290.794534648],
      likelihoodRatio: [15.0621441776, 0.0045740463472],
      wald: [14.4465910639, 0.00599802826085],
      score: [14.9838964681, 0.00473473374073],
      iterations: 4,
      n: 172,
      events: 75,
    });
  });

  it("heart, delayed entry and tied event times within strata(surgery)", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(start, stop, event) ~ age + year + transplant + strata(surgery), data = heart)
    const rows = heartRows.map((r) => ({ ...r, x: [r.x[0], r.x[1], r.x[3]], stratum: String(r.x[2]) }));
    const fit = coxRegression(rows);
    [0.0268135210045, -0.149243232804, -0.0217802512725].forEach((b, k) => expectClose(fit.coefficients[k], b, 1e-6));
    [0.0136661564569, 0.0700993275169, 0.315877308844].forEach((se, k) => expectClose(fit.standardErrors[k], se, 1e-6));
    expectClose(fit.nullLogLik, -270.397893497, 1e-9);
    expectClose(fit.logLik, -265.315129067, 1e-9);
    expectClose(fit.likelihoodRatio.chiSquare, 10.16552886, 1e-6);
    expectClose(fit.wald.chiSquare, 9.72471001662, 1e-6);
    expectClose(fit.score.chiSquare, 9.89958663642, 1e-6);
    expect(fit.iterations).toBe(4);
  });

  it("gives the same fit when every row is split into (start, stop] pieces", () => {
    // R 4.2.2, survival 3.5-3: sp <- survSplit(Surv(time, status) ~ age + sex, data = lung, cut = c(200, 400), episode = "ep");
    // coxph(Surv(tstart, time, status) ~ age + sex, data = sp) gives 429 rows and the same fit as the unsplit data.
    const cuts = [0, 200, 400];
    const split: CoxRow[] = lungRows.flatMap((row) =>
      cuts
        .filter((c) => c < row.time)
        .map((start, j, starts) => {
          const stop = j + 1 < starts.length ? starts[j + 1] : row.time;
          return { time: stop, entry: start, event: row.event && stop === row.time, x: row.x };
        }),
    );
    expect(split).toHaveLength(429);
    const fit = coxRegression(split);
    expectClose(fit.coefficients[0], 0.0170453318454, 1e-6);
    expectClose(fit.coefficients[1], -0.513218517108, 1e-6);
    expectClose(fit.logLik, -742.848245784, 1e-9);
  });
});

describe("coxRegression properties", () => {
  it("keeps its precision when rows of far larger weight leave the risk set (delayed entry)", () => {
    // 20 rows on (0, t], 20 on (100, 100 + t] whose covariate is offset by 100, and one row on (0, 200] with x = 0:
    // walking back past time 100 subtracts weights e^(100β) from sums that must then hold only weights near 1.
    const g = [1, 1, 0, 1, 1, 0, 1, 0, 0, 1, 0, 1, 0, 0, 1, 0, 0, 0, 1, 0];
    const status = [1, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1, 1, 1, 1, 0, 1, 1, 1, 0, 1];
    const rows: CoxRow[] = [
      ...g.map((v, i) => ({ entry: 0, time: i + 1, event: status[i] === 1, x: [v] })),
      ...g.map((v, i) => ({ entry: 100, time: 101 + i, event: status[i] === 1, x: [100 + v] })),
      { entry: 0, time: 200, event: false, x: [0] },
    ];
    const fit = coxRegression(rows);
    // R 4.2.2, survival 3.5-3: on these rows coxph(Surv(start, stop, status) ~ x) itself runs out of iterations
    // (coef 0.309790802399, loglik -70.9139409641). The same partial likelihood written without the offset
    // (late rows x = g, the long row split into (0, 100] with x = 0 and (100, 200] with x = −100):
    // coxph(Surv(start, stop, status) ~ x, data = b) gives coef 0.384493303357, se 0.377556287,
    // loglik -73.7605906908 then -70.9093286689, 9 iterations.
    expectClose(fit.coefficients[0], 0.384493303357, 1e-6);
    expectClose(fit.standardErrors[0], 0.377556287, 1e-6);
    expectClose(fit.nullLogLik, -73.7605906908, 1e-9);
    expectClose(fit.logLik, -70.9093286689, 1e-9);
    expect(fit.iterations).toBe(9);
  });

  it("equals the log-rank test in its score test for two groups without ties", () => {
    // Collett, Modelling Survival Data in Medical Research, 3rd ed. 2015, §3 (from memory): with one
    // 0/1 covariate and no tied times, the Cox score test of β = 0 is the log-rank test.
    const a = [[6, 1], [7, 0], [10, 1], [15, 1], [19, 0], [25, 1]];
    const b = [[1, 1], [3, 1], [4, 0], [5, 1], [8, 1], [12, 1]];
    const toObs = (g: number[][]) => g.map(([time, e]) => ({ time, event: e === 1 }));
    const rows: CoxRow[] = [
      ...toObs(a).map((o) => ({ ...o, x: [0] })),
      ...toObs(b).map((o) => ({ ...o, x: [1] })),
    ];
    const fit = coxRegression(rows);
    const lr = logRank([toObs(a), toObs(b)]);
    expectClose(fit.score.chiSquare, lr.chiSquare, 1e-12);
    // R 4.2.2, survival 3.5-3: survdiff(Surv(time, status) ~ group, d)$chisq and coxph(…)$score, d being these 12 rows
    expectClose(fit.score.chiSquare, 4.85718814195, 1e-9);
    expectClose(fit.coefficients[0], 1.69979901261, 1e-6); // R: coef(coxph(Surv(time, status) ~ group, data = d))
    expectClose(coxRegression(rows, { ties: "breslow" }).score.chiSquare, lr.chiSquare, 1e-12); // no ties: Breslow = Efron
  });

  it("does not depend on the order of the rows or the names of the strata", () => {
    const reference = coxRegression(veteranRows);
    const renamed = shuffled(veteranRows, createRng("cox-order")).map((r) => ({ ...r, stratum: `cell ${r.stratum}` }));
    const fit = coxRegression(renamed);
    fit.coefficients.forEach((b, k) => expectClose(b, reference.coefficients[k], 1e-10));
    expectClose(fit.logLik, reference.logLik, 1e-12);
  });

  it("treats an entry before every time like no entry", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(rep(0, nrow(lung)), time, status) ~ age + sex, data = lung) gives
    // coef 0.0170453318454, -0.513218517108 and loglik -749.90980139, -742.848245784, as without the entry.
    const fit = coxRegression(lungRows.map((r) => ({ ...r, entry: 0 })));
    expectClose(fit.coefficients[0], 0.0170453318454, 1e-6);
    expectClose(fit.coefficients[1], -0.513218517108, 1e-6);
    expectClose(fit.nullLogLik, -749.90980139, 1e-9);
    expectClose(fit.logLik, -742.848245784, 1e-9);
  });
});

describe("coxRegression refuses what it cannot fit", () => {
  it("names the column that copies or combines the others", () => {
    // R 4.2.2, survival 3.5-3: coxph(Surv(time, status) ~ age + sex + I(age + 2 * sex), data = lung) gives NA for the third coefficient.
    const copy = lungRows.map((r) => ({ ...r, x: [r.x[0], r.x[1], r.x[0]] }));
    expect(() => coxRegression(copy)).toThrow(RangeError);
    expect(() => coxRegression(copy)).toThrow(/cannot be told apart: column 3/);
    const combination = lungRows.map((r) => ({ ...r, x: [r.x[0], r.x[1], r.x[0] + 2 * r.x[1]] }));
    expect(() => coxRegression(combination)).toThrow(/cannot be told apart: column 3 is a copy or combination of columns 1–2/);
    const perStratum = veteranRows.map((r) => ({ ...r, x: [...r.x, r.stratum === "adeno" ? 1 : 0] }));
    expect(() => coxRegression(perStratum)).toThrow(/column 3 .*does not vary among the rows at risk \(within each stratum\)/);
    const constant = lungRows.map((r) => ({ ...r, x: [r.x[0], 1] }));
    expect(() => coxRegression(constant)).toThrow(/column 2 has the same value in every row/);
  });

  it("needs events", () => {
    expect(() => coxRegression(lungRows.map((r) => ({ ...r, event: false })))).toThrow(/no events/);
    expect(() => coxRegression([])).toThrow(/no rows/);
  });

  it("rejects ragged, non-finite and backwards rows with the row number", () => {
    const bad = (change: Partial<CoxRow>, at = 4) => lungRows.map((r, i) => (i === at ? { ...r, ...change } : r));
    expect(() => coxRegression(bad({ x: [60] }))).toThrow(/row 5 has 1 covariates but row 1 has 2/);
    expect(() => coxRegression(bad({ x: [60, Number.NaN] }))).toThrow(/row 5: covariate 2 must be a finite number/);
    expect(() => coxRegression(bad({ time: Number.POSITIVE_INFINITY }))).toThrow(/row 5: the time must be a finite number/);
    expect(() => coxRegression(bad({ entry: 883 }))).toThrow(/row 5: the entry time \(883\) must be before the time \(883\)/);
    expect(() => coxRegression(bad({ entry: Number.NaN }))).toThrow(/row 5: the entry time must be a finite number/);
    expect(() => coxRegression(bad({ stratum: "A" }))).toThrow(/stratum is given for some rows but not for others/);
    expect(() => coxRegression(lungRows, { ties: "exact" as "efron" })).toThrow(/ties must be "efron" or "breslow"/);
  });

  it("stops after 20 steps without NaN when one group has every event (the coefficient runs off)", () => {
    // R 4.2.2, survival 3.5-3: g <- c(1, 1, 1, 0, 0, 0); coxph(Surv(1:6, g) ~ g) warns "Ran out of iterations and
    // did not converge" and gives coef 21.9415472887, se 24795.05702, loglik -4.78749174278 then -1.79175947085.
    const rows: CoxRow[] = [1, 2, 3, 4, 5, 6].map((time, i) => ({ time, event: i < 3, x: [i < 3 ? 1 : 0] }));
    const fit = coxRegression(rows);
    expect(fit.converged).toBe(false);
    expect(fit.iterations).toBe(20);
    expectClose(fit.coefficients[0], 21.9415472887, 1e-6);
    expectClose(fit.standardErrors[0], 24795.05702, 1e-4);
    expectClose(fit.logLik, -1.79175947085, 1e-9);
    expect(fit.upper95[0]).toBe(Number.POSITIVE_INFINITY);
    const numbers = [...fit.coefficients, ...fit.standardErrors, ...fit.lower95, fit.logLik, fit.wald.pValue, fit.score.pValue];
    expect(numbers.some((v) => Number.isNaN(v))).toBe(false);
  });
});
