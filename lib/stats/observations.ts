// One right-censored observation: the time of the event, or of the last look without it.
export interface SurvivalObservation {
  time: number;
  event: boolean;
  /**
   * Delayed entry (left truncation): the observation is at risk only on (entry, time]. Absent means
   * at risk from the start. A row with time ≤ entry is never at risk and takes no part (R's Surv
   * makes such rows NA and drops them).
   */
  entry?: number;
}
