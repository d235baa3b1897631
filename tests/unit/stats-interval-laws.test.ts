import { describe, expect, it } from "vitest";
import { logExtremeValueBetween, logNormalBetween, logNormalCdf } from "@/lib/stats/interval-laws";
import { normalQuantile } from "@/lib/stats/distributions";

// Reference values computed with R 4.2.2 (pnorm, log.p = TRUE; extreme-value terms written out in R
// as noted beside each check); tests do not call R.

function expectClose(actual: number, expected: number, relative: number): void {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * Math.max(Math.abs(expected), 1e-300));
}

describe("tail functions", () => {
  it("log Φ matches R's pnorm(x, log.p = TRUE) from the far lower tail to the far upper tail", () => {
    const cases: [number, number][] = [
      [-40, -804.6084420137538], // R: pnorm(-40, log.p = TRUE)
      [-10, -53.23128515051247], // R: pnorm(-10, log.p = TRUE)
      [-3, -6.6077262215103492], // R: pnorm(-3, log.p = TRUE)
      [-0.5, -1.1759117615936185], // R: pnorm(-0.5, log.p = TRUE)
      [0, -0.69314718055994529], // R: pnorm(0, log.p = TRUE)
      [0.3, -0.48141016158848116], // R: pnorm(0.3, log.p = TRUE)
      [2, -0.023012909328963493], // R: pnorm(2, log.p = TRUE)
      [8, -6.2209605742717868e-16], // R: pnorm(8, log.p = TRUE)
      [30, -4.9067139271481872e-198], // R: pnorm(30, log.p = TRUE)
    ];
    for (const [x, expected] of cases) expectClose(logNormalCdf(x), expected, 1e-14);
  });

  it("Φ⁻¹ matches R's qnorm into the far tails", () => {
    const cases: [number, number][] = [
      [1e-300, -37.047096299361201], // R: qnorm(1e-300)
      [1e-20, -9.2623400897984052], // R: qnorm(1e-20)
      [1e-5, -4.2648907939228256], // R: qnorm(1e-5)
      [0.01, -2.3263478740408408], // R: qnorm(0.01)
      [0.3, -0.52440051270804067], // R: qnorm(0.3)
      [0.975, 1.9599639845400536], // R: qnorm(0.975)
      [1 - 1e-12, 7.0344869100478356], // R: qnorm(1 - 1e-12)
    ];
    for (const [p, expected] of cases) expectClose(normalQuantile(p), expected, 1e-14);
    expect(normalQuantile(0.5)).toBe(0); // R: qnorm(0.5)
  });

  it("log(Φ(b) − Φ(a)) keeps its digits where both tails underflow or cancel", () => {
    expectClose(logNormalBetween(8, 9), -35.013618593437151, 1e-12); // R: log(pnorm(8, lower.tail = FALSE) - pnorm(9, lower.tail = FALSE))
    expectClose(logNormalBetween(-31, -30), -454.32124395634327, 1e-12); // R: log(pnorm(-30) - pnorm(-31))
    // R: la <- pnorm(40, lower.tail = FALSE, log.p = TRUE); lb <- pnorm(41, lower.tail = FALSE, log.p = TRUE); la + log1p(-exp(lb - la))
    expectClose(logNormalBetween(40, 41), -804.6084420137538, 1e-12);
    expectClose(logNormalBetween(-0.5, 1.5), -0.47055536541589971, 1e-14); // R: log(pnorm(1.5) - pnorm(-0.5))
    expectClose(logNormalBetween(-Infinity, -10), -53.23128515051247, 1e-14); // R: pnorm(-10, log.p = TRUE)
    expectClose(logNormalBetween(-8, Infinity), -6.2209605742717868e-16, 1e-14); // R: pnorm(8, log.p = TRUE)
  });

  it("log(S(a) − S(b)) of the extreme-value law, S(w) = exp(−exp(w)), in the body and both tails", () => {
    expectClose(logExtremeValueBetween(-1, 0.5), -0.69333723460430818, 1e-13); // R: log(exp(-exp(-1)) - exp(-exp(0.5)))
    expectClose(logExtremeValueBetween(5, 5.1), -148.41315926899711, 1e-13); // R: log(exp(-exp(5)) - exp(-exp(5.1)))
    // Both survivals underflow in double precision; R: -exp(7) + log1p(-exp(exp(7) - exp(7.001)))
    expectClose(logExtremeValueBetween(7, 7.001), -1097.0393396202346, 1e-13);
    // Both survivals round to 1; to first order S(a) − S(b) = e^b − e^a. R: log(exp(-29) - exp(-30))
    expectClose(logExtremeValueBetween(-30, -29), Math.log(Math.exp(-29) - Math.exp(-30)), 1e-10);
    expectClose(logExtremeValueBetween(-Infinity, -40), -40, 1e-15); // R: log(-expm1(-exp(-40)))
    expectClose(logExtremeValueBetween(3, Infinity), -20.085536923187668, 1e-15); // R: -exp(3)
  });
});
