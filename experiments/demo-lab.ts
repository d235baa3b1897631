// The demo scenario: an invented regional natural-history collection testing how storage humidity
// and surface treatment affect rusting of iron and stony-iron slices. Every name, label, find name
// and number here is invented for the demo; nothing describes a real institution or specimen.
import { createRng, randomNormal, type Rng } from "@/lib/allocation/prng";

export const DEMO_PASSWORD = "rustline-demo-1";

export const demoLab = { name: "Tarrow Valley Natural History Collection" };

export const demoUsers = [
  { key: "lead", name: "Maren Oakes", email: "lead@tarrow.example", role: "lead" },
  { key: "researcher", name: "Tomasz Ridley", email: "researcher@tarrow.example", role: "researcher" },
  { key: "technician", name: "Priya Castell", email: "technician@tarrow.example", role: "technician" },
  { key: "scorer", name: "Jonah Feld", email: "scorer@tarrow.example", role: "technician" },
  { key: "observer", name: "Ines Calloway", email: "observer@tarrow.example", role: "observer" },
] as const;

export type DemoChamber = {
  key: string;
  name: string;
  kind: "saturated-salt" | "desiccant" | "water";
  saltId?: "MgCl2" | "NaCl";
  desiccantKind?: "molecular-sieve-4a";
  desiccantMassG?: number;
  nominalTempC: number;
  volumeL: number;
  setpointRhPercent: number;
  toleranceRhPercent: number;
  notes: string;
};

export const demoChambers: DemoChamber[] = [
  { key: "sieve", name: "Jar A · molecular sieve 4A", kind: "desiccant", desiccantKind: "molecular-sieve-4a", desiccantMassG: 150, nominalTempC: 21, volumeL: 2, setpointRhPercent: 2, toleranceRhPercent: 2, notes: "Sieve beads in a perforated cup under a mesh shelf." },
  { key: "mgcl2", name: "Jar B · saturated MgCl2", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 21, volumeL: 2, setpointRhPercent: 33, toleranceRhPercent: 2, notes: "Slurry in a dish; specimens on a glass stand well above it." },
  { key: "nacl", name: "Jar C · saturated NaCl", kind: "saturated-salt", saltId: "NaCl", nominalTempC: 21, volumeL: 2, setpointRhPercent: 75.4, toleranceRhPercent: 2, notes: "Slurry in a dish; specimens on a glass stand well above it." },
  { key: "water", name: "Jar D · pure water", kind: "water", nominalTempC: 21, volumeL: 2, setpointRhPercent: 96, toleranceRhPercent: 4, notes: "Distilled water in a dish; expect readings in the 90s." },
];

export const demoTreatments = [
  { key: "control", name: "Uncoated control", kind: "control", description: "Cut face left as prepared.", protocol: "Dry-polished to 1200 grit, degreased in ethanol, handled with nitrile gloves." },
  { key: "wax", name: "Microcrystalline wax", kind: "coating", description: "Thin wax film over the cut face.", protocol: "Warm the slice to 40 °C, apply a thin wax layer, buff after 10 minutes." },
  { key: "lacquer", name: "Acrylic lacquer", kind: "coating", description: "Two brushed coats of an acrylic lacquer in solvent.", protocol: "Two thin coats 1 h apart in a fume cupboard; cure 48 h before exposure." },
] as const;

const findNames = ["Corvenlow Tarn", "Esker Holloway", "Marrowby Sands", "Fennick Lowe", "Drumcairn Scar", "Velloby Rigg"];

export type DemoSpecimen = { label: string; materialClass: "iron-meteorite" | "stony-iron"; findName: string; face: string; surfacePrep: string; massG: number; history: string; contaminationNotes: string; parentPiece: string; slice: string; provenance: string };

export function demoSpecimens(): DemoSpecimen[] {
  const rng = createRng("tarrow-specimens");
  const out: DemoSpecimen[] = [];
  for (let i = 0; i < 24; i++) {
    const stony = i % 3 === 2;
    const find = findNames[i % findNames.length];
    out.push({
      label: `TV-${stony ? "S" : "M"}-${String(i + 1).padStart(3, "0")}`,
      materialClass: stony ? "stony-iron" : "iron-meteorite",
      findName: find,
      face: stony ? "cut face, metal with olivine" : "cut face, etched",
      surfacePrep: stony ? "cut, dry-polished" : "cut, polished, etched",
      massG: Math.round((12 + rng() * 40) * 10) / 10,
      history: `Slice from the ${find} mass, cut in 2025 for the trial.`,
      contaminationNotes: i % 5 === 0 ? "Earlier rust spots removed from the rind side; possible residual chloride." : "",
      parentPiece: `${find} main mass`,
      slice: `S${Math.floor(i / findNames.length) + 1}`,
      provenance: `${find}: found by a field survey in 1978, Tarrow collection since 1979 (invented for the demo).`,
    });
  }
  return out;
}

/**
 * Invented history of a demo specimen, in days before the trial's start: a chloride spot test three
 * weeks before (chloride found where the contamination notes suspect it) and a weighing two weeks before.
 */
export function demoSpecimenHistory(sp: DemoSpecimen) {
  return {
    chloride: { daysBeforeStart: 21, method: "silver-nitrate-spot", result: sp.contaminationNotes ? "present" : "absent" },
    weighing: { daysBeforeStart: 14, massG: sp.massG.toFixed(4) },
  };
}

export const demoTrial = {
  title: "Storage humidity × surface treatment, 2026 slices",
  question: "How long do cut iron and stony-iron slices stay free of rust at four storage humidities, bare or coated?",
  hypothesis: "Slices in the desiccated jar stay rust-free for the whole trial; coatings delay, but do not prevent, rust at 75 %RH and above.",
  replicatesPerArm: 2,
  allocationSeed: "tarrow-2026",
  schedulePlan: { kind: "geometric" as const, count: 9 },
  // Day 56 falls two days after the seed's "today", so the due list has something on it.
  startedDaysAgo: 54,
  photoProtocol: [
    "Same camera, lens and distance for every photo; note the settings once per series.",
    "Diffuse light from two sides at 45°; no flash.",
    "Scale bar and a grey/colour reference card in every frame.",
    "Cut face square to the lens, filling most of the frame.",
    "Photograph within 10 minutes of opening the jar; close it again promptly.",
  ],
};

// Rust onset hazard per day by chamber and treatment (invented for the demo).
const onsetRate: Record<string, Record<string, number>> = {
  sieve: { control: 0, wax: 0, lacquer: 0 },
  mgcl2: { control: 0.012, wax: 0.004, lacquer: 0.002 },
  nacl: { control: 0.12, wax: 0.035, lacquer: 0.02 },
  water: { control: 0.45, wax: 0.1, lacquer: 0.06 },
};

export type DemoSpecimenCourse = { onsetDay: number | null; growthPerDay: number; weepingFromDay: number | null };

/** A deterministic course of rust for one specimen: when it starts and how fast it grows. */
export function demoCourse(chamberKey: string, treatmentKey: string, specimenIndex: number): DemoSpecimenCourse {
  const rng: Rng = createRng(`course-${chamberKey}-${treatmentKey}-${specimenIndex}`);
  const rate = onsetRate[chamberKey]?.[treatmentKey] ?? 0;
  if (rate === 0) return { onsetDay: null, growthPerDay: 0, weepingFromDay: null };
  const onset = -Math.log(1 - rng()) / rate;
  const growth = 0.02 * (1 + rng()) * (chamberKey === "water" ? 3 : chamberKey === "nacl" ? 1.6 : 0.6);
  const weeping = chamberKey !== "mgcl2" && rng() < 0.5 ? onset + 3 + rng() * 10 : null;
  return { onsetDay: onset > 200 ? null : onset, growthPerDay: growth, weepingFromDay: weeping };
}

/** Rusted area % on a given day for a course (exponential growth from a small first spot). */
export function demoAreaPercent(course: DemoSpecimenCourse, day: number): number {
  if (course.onsetDay == null || day < course.onsetDay) return 0;
  const a = 0.02 * Math.exp(course.growthPerDay * 6 * Math.sqrt(day - course.onsetDay + 1));
  return Math.min(60, Math.round(a * 1000) / 1000);
}

/** Hourly climate for a chamber: setpoint, noise, and a short excursion toward room air at each opening. */
export function demoReading(chamber: DemoChamber, hoursSinceStart: number, openingHours: number[], rng: Rng) {
  let rh = chamber.setpointRhPercent + randomNormal(rng) * (chamber.kind === "desiccant" ? 0.25 : 0.4);
  const room = 45;
  for (const h of openingHours) {
    const dt = hoursSinceStart - h;
    if (dt >= 0 && dt < 12) rh += (room - chamber.setpointRhPercent) * 0.5 * Math.exp(-dt / 2);
  }
  if (chamber.kind === "desiccant") rh += hoursSinceStart / 24 / 56 * 0.8; // slow loading of the sieve
  const tempC = chamber.nominalTempC + Math.sin((hoursSinceStart / 24) * 2 * Math.PI) * 0.6 + randomNormal(rng) * 0.1;
  return { rhPercent: Math.max(0.5, Math.min(100, Math.round(rh * 10) / 10)), tempC: Math.round(tempC * 100) / 100 };
}

// A second, finished trial: bare and waxed slices at five humidity levels, two jars per level, so the
// humidity response and a storage threshold have data. Invented, like everything here.
export type LadderChamber = DemoChamber & { level: number };

const ladderSalts = [
  { saltId: "LiCl", level: 1 },
  { saltId: "MgCl2", level: 2 },
  { saltId: "Mg(NO3)2", level: 3 },
  { saltId: "NaCl", level: 4 },
  { saltId: "KCl", level: 5 },
] as const;

/** Setpoints come from the salt tables at 21 °C by the caller (lib/humidity/salts). */
export function ladderChambers(setpointOf: (saltId: string) => number): LadderChamber[] {
  return ladderSalts.flatMap(({ saltId, level }) => (["a", "b"] as const).map((jar) => ({
    key: `ladder-${level}${jar}`,
    name: `Ladder ${level}${jar.toUpperCase()} · saturated ${saltId}`,
    kind: "saturated-salt" as const,
    saltId: saltId as DemoChamber["saltId"],
    nominalTempC: 21,
    volumeL: 1,
    setpointRhPercent: Math.round(setpointOf(saltId) * 10) / 10,
    toleranceRhPercent: 2,
    notes: "Humidity ladder jar: slurry in a dish, slices on a glass stand.",
    level,
  })));
}

export const ladderTreatmentKeys = ["control", "wax"] as const;

export const ladderTrial = {
  title: "Humidity ladder, bare and waxed slices, 2026",
  question: "Below what storage humidity do cut iron and stony-iron slices stay free of rust for a decade, bare or waxed?",
  hypothesis: "Time to first rust falls steeply between 50 and 75 %RH; wax shifts the curve but does not remove the need for dry storage.",
  replicatesPerArm: 2,
  allocationSeed: "tarrow-ladder-2026",
  scheduleDays: [0, 7, 14, 28, 42, 56, 84, 112, 140, 168],
  startedDaysAgo: 240,
  concludedAfterDays: 170,
};

/** Ladder specimen labels and their material (every third is stony-iron). */
export function ladderSpecimens(): DemoSpecimen[] {
  const rng = createRng("tarrow-ladder-specimens");
  return Array.from({ length: 40 }, (_, i) => {
    const stony = i % 3 === 2;
    // Other finds than the running trial's first one, so a search by find name keeps to one trial's slices.
    const find = findNames[1 + (i % (findNames.length - 1))];
    return {
      label: `TV-L-${String(i + 1).padStart(3, "0")}`,
      materialClass: stony ? "stony-iron" : "iron-meteorite",
      findName: find,
      face: stony ? "cut face, metal with olivine" : "cut face, etched",
      surfacePrep: stony ? "cut, dry-polished" : "cut, polished, etched",
      massG: Math.round((8 + rng() * 25) * 10) / 10,
      history: `Thin slice from the ${find} mass, cut in 2025 for the humidity ladder.`,
      contaminationNotes: "",
      parentPiece: `${find} ladder piece`,
      slice: `L${i + 1}`,
      provenance: `${find}: Tarrow collection since 1979 (invented for the demo).`,
    };
  });
}

/**
 * Onset of rust for a ladder specimen from an invented Weibull model of the kind the product fits:
 * log T = 9.55 − 0.149·(RH − 35) + 1.0·waxed − 0.3·stony + 0.6·W, W standard minimum extreme value.
 */
export function ladderCourse(rhPercent: number, treatmentKey: string, materialClass: string, label: string): DemoSpecimenCourse {
  const rng: Rng = createRng(`ladder-${label}`);
  const mu = 9.55 - 0.149 * (rhPercent - 35) + (treatmentKey === "wax" ? 1.0 : 0) + (materialClass === "stony-iron" ? -0.3 : 0);
  const w = Math.log(-Math.log(1 - rng()));
  const onset = Math.exp(mu + 0.6 * w);
  const growth = 0.02 * (1 + rng()) * (rhPercent > 80 ? 2.5 : rhPercent > 70 ? 1.6 : 0.6);
  const weeping = rhPercent > 70 && rng() < 0.4 ? onset + 5 + rng() * 15 : null;
  return { onsetDay: onset > 400 ? null : onset, growthPerDay: growth, weepingFromDay: weeping };
}
