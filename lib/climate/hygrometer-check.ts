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

// ——— Two salts: offset and slope ———

export interface TwoSaltCheckInput {
  tempC: number;
  first: { salt: SaltId; readingRhPercent: number };
  second: { salt: SaltId; readingRhPercent: number };
}

/**
 * A linear correction, corrected = gain × reading + shiftRhPercent. One salt gives gain 1 and
 * shift −offset; two salts give the line through both (reading, reference) points.
 */
export interface LinearCorrection {
  gain: number;
  shiftRhPercent: number;
}

export interface TwoSaltCorrection extends LinearCorrection {
  first: HygrometerOffset;
  second: HygrometerOffset;
  /** The instrument's response: change in reading per %RH of true change (1 = no slope error). */
  slope: number;
}

function checkReading(readingRhPercent: number): void {
  if (!Number.isFinite(readingRhPercent) || readingRhPercent < 0 || readingRhPercent > 100) {
    throw new RangeError(`Reading must be between 0 % and 100 %; got ${readingRhPercent}`);
  }
}

/** The correction from readings over two different salts at one temperature. */
export function twoSaltCorrection({ tempC, first, second }: TwoSaltCheckInput): TwoSaltCorrection {
  if (first.salt === second.salt) throw new RangeError("A two-salt check needs two different salts.");
  checkReading(first.readingRhPercent);
  checkReading(second.readingRhPercent);
  const a = hygrometerOffset({ readingRhPercent: first.readingRhPercent, salt: first.salt, tempC });
  const b = hygrometerOffset({ readingRhPercent: second.readingRhPercent, salt: second.salt, tempC });
  const slope = (second.readingRhPercent - first.readingRhPercent) / (b.referenceRhPercent - a.referenceRhPercent);
  if (!(slope > 0) || !Number.isFinite(slope)) {
    throw new RangeError("The reading over the wetter salt must be higher than over the drier one.");
  }
  const gain = 1 / slope;
  return { first: a, second: b, slope, gain, shiftRhPercent: a.referenceRhPercent - gain * first.readingRhPercent };
}

/**
 * The correction a stored check stands for: without a slope (one salt) the offset alone; with one
 * (two salts) the line through the first salt's (reading, reference) point with that slope.
 */
export function correctionOf(check: { offsetRhPercent: number; readingRhPercent: number; referenceRhPercent: number; slope?: number | null }): LinearCorrection {
  if (check.slope == null) return { gain: 1, shiftRhPercent: -check.offsetRhPercent };
  const gain = 1 / check.slope;
  return { gain, shiftRhPercent: check.referenceRhPercent - gain * check.readingRhPercent };
}

export type TimedCorrection = LinearCorrection & { atMs: number };

/**
 * Drift between checks: the correction at a time is the linear interpolation, in time, of the
 * checks either side (so a reading is corrected by the time-weighted mix of both corrections);
 * before the first check and after the last one the nearest check is held. checks sorted by atMs.
 * null when there is no check. The one rule for every corrected reading: exposure, and the chamber
 * chart and band statistics through lib/climate/check-timeline.
 */
export function correctionAt(checks: readonly TimedCorrection[], tMs: number): LinearCorrection | null {
  if (checks.length === 0) return null;
  if (tMs <= checks[0].atMs) return checks[0];
  const last = checks[checks.length - 1];
  if (tMs >= last.atMs) return last;
  let i = 1;
  while (checks[i].atMs < tMs) i++;
  const a = checks[i - 1];
  const b = checks[i];
  if (b.atMs === a.atMs) return b;
  const w = (tMs - a.atMs) / (b.atMs - a.atMs);
  return { gain: a.gain + w * (b.gain - a.gain), shiftRhPercent: a.shiftRhPercent + w * (b.shiftRhPercent - a.shiftRhPercent) };
}

/** A raw reading under a linear correction, kept within 0–100 %RH (raw when there is none). */
export function applyCorrection(readingRhPercent: number, c: LinearCorrection | null): number {
  if (!c) return readingRhPercent;
  return Math.min(100, Math.max(0, c.gain * readingRhPercent + c.shiftRhPercent));
}
