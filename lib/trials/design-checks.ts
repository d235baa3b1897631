// Designs that cannot answer their question, each with one plain sentence saying why and what to do.
// Shown on the design form as the user picks chambers, treatments and replicates, and on the trial
// page while the trial is a draft. Warnings, not refusals: a pilot may break these on purpose.

export type DesignArm = {
  chamberId: string;
  chamberName: string;
  setpointRhPercent: number;
  /** When given, jars at different temperatures are flagged too. */
  nominalTempC?: number;
  treatmentId: string;
  treatmentName: string;
  treatmentKind: string;
};

export type DesignWarningCode = "one-jar-per-humidity" | "chamber-without-control" | "few-humidity-levels" | "few-replicates" | "mixed-temperatures";
export type DesignWarning = { code: DesignWarningCode; message: string };

/** Setpoints within the same whole %RH are one humidity level (setpoints are set to about ±1 %RH). */
export const humidityLevel = (setpointRhPercent: number) => Math.round(setpointRhPercent);

/** A humidity response (a curve, not only a line through two points) needs at least this many levels. */
export const MIN_HUMIDITY_LEVELS = 3;
export const MIN_REPLICATES = 2;

/** Every chamber × every treatment, as the design form creates the arms. */
export function crossArms(
  chambers: { id: string; name: string; setpointRhPercent: number; nominalTempC?: number }[],
  treatments: { id: string; name: string; kind: string }[],
): DesignArm[] {
  return chambers.flatMap((c) => treatments.map((t) => ({
    chamberId: c.id, chamberName: c.name, setpointRhPercent: c.setpointRhPercent, nominalTempC: c.nominalTempC,
    treatmentId: t.id, treatmentName: t.name, treatmentKind: t.kind,
  })));
}

function joinAnd(items: string[]): string {
  return items.length <= 1 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

type Chamber = { id: string; name: string; level: number; tempC?: number; hasControl: boolean };

function chambersOf(arms: DesignArm[]): Chamber[] {
  const byId = new Map<string, Chamber>();
  for (const a of arms) {
    const c = byId.get(a.chamberId) ?? { id: a.chamberId, name: a.chamberName, level: humidityLevel(a.setpointRhPercent), tempC: a.nominalTempC, hasControl: false };
    if (a.treatmentKind === "control") c.hasControl = true;
    byId.set(a.chamberId, c);
  }
  return [...byId.values()];
}

/** The warnings for a design; empty when there are no arms yet (nothing to judge). */
export function designWarnings({ arms, replicatesPerArm }: { arms: DesignArm[]; replicatesPerArm: number }): DesignWarning[] {
  if (arms.length === 0) return [];
  const chambers = chambersOf(arms);
  const levels = [...new Set(chambers.map((c) => c.level))].sort((a, b) => a - b);
  const warnings: DesignWarning[] = [];

  const lone = levels.map((level) => chambers.filter((c) => c.level === level)).filter((at) => at.length === 1).map(([c]) => c);
  if (lone.length > 0) {
    warnings.push({
      code: "one-jar-per-humidity",
      message: `Only one jar at ${joinAnd(lone.map((c) => `${c.level} %RH (${c.name})`))}: with one jar per humidity level, humidity and jar cannot be told apart, so anything peculiar to that jar looks like an effect of humidity. Put at least two jars at each humidity level.`,
    });
  }

  const noControl = chambers.filter((c) => !c.hasControl);
  if (noControl.length > 0) {
    const all = noControl.length === chambers.length;
    warnings.push({
      code: "chamber-without-control",
      message: `${all ? "No jar has the control treatment" : `${joinAnd(noControl.map((c) => c.name))} ${noControl.length === 1 ? "has" : "have"} no control treatment`}: treatment effects in ${noControl.length === 1 ? "that jar" : "those jars"} have nothing to be read against. Add a control treatment (e.g. an untreated slice) to every jar.`,
    });
  }

  if (levels.length < MIN_HUMIDITY_LEVELS) {
    warnings.push({
      code: "few-humidity-levels",
      message: `Only ${levels.length} humidity level${levels.length === 1 ? "" : "s"} (${joinAnd(levels.map(String))} %RH): no storage rule can be estimated, because a humidity response needs at least ${MIN_HUMIDITY_LEVELS} levels.`,
    });
  }

  if (Number.isInteger(replicatesPerArm) && replicatesPerArm >= 1 && replicatesPerArm < MIN_REPLICATES) {
    warnings.push({
      code: "few-replicates",
      message: `One specimen per arm: the spread between specimens treated alike cannot be estimated, and one odd specimen decides its arm. Use at least ${MIN_REPLICATES} replicates per arm.`,
    });
  }

  const temps = [...new Set(chambers.flatMap((c) => (c.tempC === undefined ? [] : [Math.round(c.tempC)])))].sort((a, b) => a - b);
  if (temps.length > 1) {
    warnings.push({
      code: "mixed-temperatures",
      message: `The jars are at different temperatures (${joinAnd(temps.map(String))} °C): effects of temperature mix with those of humidity. Keep every jar at the same temperature.`,
    });
  }
  return warnings;
}
