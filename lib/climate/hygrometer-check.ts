// Checking a hygrometer against a saturated salt fixed point: the offset is what the instrument
// reads minus what the salt holds at that temperature. Subtracting it from later readings corrects
// them at that RH; far from the check point the correction is only as good as the sensor is linear,
// which is why two salts (e.g. MgCl2 and NaCl) bracketing the band are the usual practice.

import { saltEquilibriumRh, SALTS, type SaltId } from "@/lib/humidity/salts";

export interface HygrometerCheckInput {
  readingRhPercent: number;
  salt: SaltId;
  tempC: number;
}

export interface HygrometerOffset {
  salt: SaltId;
  tempC: number;
  referenceRhPercent: number;
  /** Reading − reference; positive means the instrument reads high. */
  offsetPercent: number;
  /** Uncertainty of the salt reference alone (Greenspan 1977), not of the instrument. */
  referenceUncertaintyPercent: number | null;
  source: string;
}

export function hygrometerOffset({ readingRhPercent, salt, tempC }: HygrometerCheckInput): HygrometerOffset {
  if (!Number.isFinite(readingRhPercent) || readingRhPercent < 0 || readingRhPercent > 100) {
    throw new RangeError(`Reading must be between 0 % and 100 %; got ${readingRhPercent}`);
  }
  const reference = saltEquilibriumRh(salt, tempC);
  return {
    salt,
    tempC,
    referenceRhPercent: reference.rhPercent,
    offsetPercent: readingRhPercent - reference.rhPercent,
    referenceUncertaintyPercent: reference.uncertaintyPercent,
    source: SALTS[salt].source,
  };
}

/** Corrected RH: reading minus the offset, kept within 0–100 %. */
export function applyOffset(readingRhPercent: number, offset: number | Pick<HygrometerOffset, "offsetPercent">): number {
  const offsetPercent = typeof offset === "number" ? offset : offset.offsetPercent;
  return Math.min(100, Math.max(0, readingRhPercent - offsetPercent));
}
