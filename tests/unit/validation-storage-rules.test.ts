// The humidity response's URL choices: good values are used, a bad one falls back to its default
// and is named, so the page says what it showed instead of what was asked.
import { describe, expect, it } from "vitest";
import { responseOptions, responsePageQuery } from "@/lib/validation/storage-rules";

describe("responsePageQuery", () => {
  it("takes good values and reports nothing", () => {
    const id = "7d3a7a2e-3f4b-4c1e-9a55-0a8f2b1c9d10";
    const { query, problems } = responsePageQuery({ share: "5", horizon: "20", pool: id, cov: ["initialMass", "chloride", "chloride"] });
    expect(query).toEqual({ share: 5, horizon: 20, pool: [id], cov: ["initialMass", "chloride"] });
    expect(problems).toEqual([]);
    // 20 years of 365.25 days (Julian years, as the page's horizon)
    expect(responseOptions(query)).toEqual({ p: 0.05, horizonDays: 7305 });
  });

  it("names each bad value and shows the default instead", () => {
    const { query, problems } = responsePageQuery({ share: "500", horizon: "abc", pool: "not-a-trial", cov: "colour" });
    expect(query).toEqual({ share: 10, horizon: 10, pool: [], cov: [] });
    expect(problems).toEqual([
      "The share rusted must be at most 50 %. Showing 10 %.",
      "Enter the horizon in years. Showing 10 years.",
      "Pick trials from the list. No trials are pooled.",
      "Covariates are chloride and initialMass. No history covariates are used.",
    ]);
  });

  it("reports nothing when a choice is simply left out", () => {
    expect(responsePageQuery({}).problems).toEqual([]);
  });
});
