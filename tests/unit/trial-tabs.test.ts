// The trial tab a page highlights, from its path alone (the rule in lib/trials/tabs.ts).
import { describe, expect, it } from "vitest";
import { activeTrialTab } from "@/lib/trials/tabs";

const T = "0b7c0d9e-1111-4222-8333-444455556666";
const I = "1b7c0d9e-1111-4222-8333-444455556666";
const S = "2b7c0d9e-1111-4222-8333-444455556666";

describe("activeTrialTab", () => {
  it("puts every score page under Scoring, not under Schedule", () => {
    expect(activeTrialTab(`/trials/${T}/inspections/${I}/score/${S}`, T)).toBe("scoring");
    expect(activeTrialTab(`/trials/${T}/inspections/${I}/score`, T)).toBe("scoring");
    expect(activeTrialTab(`/trials/${T}/scoring`, T)).toBe("scoring");
    expect(activeTrialTab(`/trials/${T}/scoring/${S}`, T)).toBe("scoring");
  });

  it("puts an inspection and its photos under Schedule", () => {
    expect(activeTrialTab(`/trials/${T}/inspections/${I}`, T)).toBe("schedule");
    expect(activeTrialTab(`/trials/${T}/inspections/${I}/photos`, T)).toBe("schedule");
    expect(activeTrialTab(`/trials/${T}/schedule`, T)).toBe("schedule");
  });

  it("puts the overview and the edit page under Overview, other tabs under themselves", () => {
    expect(activeTrialTab(`/trials/${T}`, T)).toBe("");
    expect(activeTrialTab(`/trials/${T}/edit`, T)).toBe("");
    expect(activeTrialTab(`/trials/${T}/grid`, T)).toBe("grid");
    expect(activeTrialTab(`/trials/${T}/compare`, T)).toBe("compare");
    // A trial id that starts like this one's is another trial.
    expect(activeTrialTab(`/trials/${T}x/scoring`, T)).toBeNull();
  });
});
