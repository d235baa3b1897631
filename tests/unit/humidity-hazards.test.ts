// The cautions a user sees for each salt, desiccant and indicator choice, and the field messages
// the chamber form gives for bad combinations.
import { describe, expect, it } from "vitest";
import { DESICCANTS, INDICATOR_KINDS } from "@/lib/humidity/desiccant";
import { hazardNoteLines, hazardNotes, SDS_DEFERRAL } from "@/lib/humidity/hazards";
import { chamberSchema } from "@/lib/validation/chambers";

const codes = (notes: ReturnType<typeof hazardNotes>) => notes.ghs.map((s) => s.code);
const text = (notes: ReturnType<typeof hazardNotes>) => notes.cautions.join(" ");

describe("saturated lithium bromide and potassium hydroxide", () => {
  it("shows potassium hydroxide as corrosive with its caustic handling cautions", () => {
    const notes = hazardNotes({ kind: "saturated-salt", salt: "KOH" });
    // Suppliers' SDS for potassium hydroxide, from memory: Met. Corr. 1 H290, Acute Tox. 4 H302, Skin Corr. 1A H314
    expect(codes(notes)).toEqual(["H290", "H302", "H314"]);
    // GHS (UN Purple Book) standard wording of H314
    expect(notes.ghs.find((s) => s.code === "H314")?.text).toBe("Causes severe skin burns and eye damage");
    expect(text(notes)).toMatch(/caustic.*goggles.*alkali-resistant gloves/);
    // common lab practice: KOH absorbs CO2 from air and turns to carbonate
    expect(text(notes)).toMatch(/carbon dioxide/);
    expect(text(notes)).not.toMatch(/chloride salt/);
    expect(hazardNoteLines(notes).at(-1)).toBe(SDS_DEFERRAL);
  });

  it("shows lithium bromide's statements and that its brine corrodes metal", () => {
    const notes = hazardNotes({ kind: "saturated-salt", salt: "LiBr" });
    // Suppliers' SDS for lithium bromide, from memory: H302 H315 H317 H319
    expect(codes(notes)).toEqual(["H302", "H315", "H317", "H319"]);
    expect(text(notes)).toMatch(/brine corrodes steel, copper and brass/);
    expect(notes.deferral).toBe(SDS_DEFERRAL);
  });
});

describe("calcium chloride", () => {
  it("warns that it deliquesces into a chloride brine that must never reach iron", () => {
    const notes = hazardNotes({ kind: "desiccant", desiccant: "calcium-chloride" });
    // Suppliers' SDS for anhydrous calcium chloride, from memory: Eye Irrit. 2 H319
    expect(codes(notes)).toEqual(["H319"]);
    // CRC Handbook, "Constant humidity solutions": CaCl2·6H2O about 29 %RH at 25 °C
    expect(text(notes)).toMatch(/deliquesces: above roughly 30 %RH/);
    // conservation practice (from memory): chloride drives akaganeite formation and weeping on iron
    expect(text(notes)).toMatch(/akaganeite and weeping on iron/);
    expect(text(notes)).toMatch(/never place it where the brine or its dust can reach a specimen/);
  });

  it("ignores an indicator choice (it takes none) and refuses one on the form", () => {
    expect(codes(hazardNotes({ kind: "desiccant", desiccant: "calcium-chloride", indicator: "cobalt-chloride" }))).toEqual(["H319"]);
    const parsed = chamberSchema.safeParse({
      name: "CaCl2 jar", kind: "desiccant", desiccantKind: "calcium-chloride", desiccantIndicator: "cobalt-chloride",
      desiccantMassG: "100", nominalTempC: "20", setpointRhPercent: "10",
    });
    expect(parsed.success).toBe(false);
    const issue = parsed.error!.issues.find((i) => i.path[0] === "desiccantIndicator");
    expect(issue?.message).toMatch(/Calcium chloride, anhydrous takes no colour indicator/);
  });
});

describe("silica gel indicators", () => {
  it("offers the indicator only for silica gels", () => {
    expect(Object.values(DESICCANTS).filter((d) => d.takesIndicator).map((d) => d.kind)).toEqual(["silica-gel", "silica-gel-conditioned"]);
    expect(INDICATOR_KINDS).toEqual(["none", "cobalt-chloride", "cobalt-free"]);
  });

  for (const desiccant of ["silica-gel", "silica-gel-conditioned"] as const) {
    it(`${desiccant}: cobalt chloride brings its carcinogen statements and the cobalt-free advice`, () => {
      const notes = hazardNotes({ kind: "desiccant", desiccant, indicator: "cobalt-chloride" });
      // EU CLP Annex VI harmonised classification of cobalt(II) chloride, from memory:
      // Carc. 1B H350i, Repr. 1B H360F, Muta. 2 H341, Resp. Sens. 1 H334, Skin Sens. 1 H317, Acute Tox. 4 H302, Aquatic Chronic 1 H410
      expect(codes(notes)).toEqual(["H350i", "H360F", "H341", "H334", "H317", "H302", "H410"]);
      // GHS (UN Purple Book) standard wording of H350i
      expect(notes.ghs[0].text).toBe("May cause cancer by inhalation");
      expect(text(notes)).toMatch(/category 1B carcinogen.*Prefer a cobalt-free indicator/);
    });

    it(`${desiccant}: a cobalt-free indicator gets no cobalt statements but a check-the-SDS note`, () => {
      const notes = hazardNotes({ kind: "desiccant", desiccant, indicator: "cobalt-free" });
      expect(codes(notes)).toEqual([]);
      expect(text(notes)).toMatch(/Cobalt-free indicators .* check their SDS/);
      expect(text(notes)).not.toMatch(/category 1B carcinogen/);
      expect(codes(hazardNotes({ kind: "desiccant", desiccant, indicator: "none" }))).toEqual([]);
    });
  }

  it("keeps the indicator a silica gel chamber was saved with, and drops it for other kinds", () => {
    const base = { name: "Gel jar", kind: "desiccant", desiccantMassG: "200", nominalTempC: "20", setpointRhPercent: "40", desiccantIndicator: "cobalt-free" };
    expect(chamberSchema.parse({ ...base, desiccantKind: "silica-gel-conditioned" }).desiccantIndicator).toBe("cobalt-free");
    expect(chamberSchema.parse({ ...base, kind: "water", desiccantKind: "silica-gel" }).desiccantIndicator).toBeNull();
    const bad = chamberSchema.safeParse({ ...base, desiccantKind: "silica-gel", desiccantIndicator: "cobalt-blue" });
    expect(bad.error!.issues.find((i) => i.path[0] === "desiccantIndicator")?.message).toBe("Choose the indicator, or “No indicator”.");
  });
});

describe("conditioned silica gel", () => {
  it("tells the user to condition it to the target first and to recondition it", () => {
    const notes = hazardNotes({ kind: "desiccant", desiccant: "silica-gel-conditioned" });
    // conservation practice, from memory: a buffer is conditioned to the target RH and drifts towards the room RH
    expect(text(notes)).toMatch(/Condition the gel at the target RH before use/);
    expect(text(notes)).toMatch(/recondition it when the jar leaves its band/);
  });
});

describe("salt temperature range on the form", () => {
  it("puts a clear message at the temperature field when a new salt is outside its fit range", () => {
    const parsed = chamberSchema.safeParse({ name: "KOH jar", kind: "saturated-salt", saltId: "KOH", nominalTempC: "2" });
    expect(parsed.success).toBe(false);
    const issue = parsed.error!.issues.find((i) => i.path[0] === "nominalTempC");
    expect(issue?.message).toBe("Potassium hydroxide (KOH): our fit to Greenspan 1977 Table 1 covers 5–50 °C; enter a temperature in that range.");
    // Greenspan 1977 Table 1 at 20 °C, from memory: LiBr 6.61 %RH (the default setpoint, rounded to 0.1)
    expect(chamberSchema.parse({ name: "LiBr jar", kind: "saturated-salt", saltId: "LiBr", nominalTempC: "20" }).setpointRhPercent).toBe(6.6);
  });
});
