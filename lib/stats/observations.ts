// One right-censored observation: the time of the event, or of the last look without it.
export interface SurvivalObservation {
  time: number;
  event: boolean;
}
