"use client";
// The photo protocol points ticked at the bench, shared by the checklist (which sets them) and the
// uploader (which records them with each photo it finalises while they are set).
import { createContext, useContext, useRef, useState } from "react";

type Ticks = { steps: string[]; done: boolean[]; set: (i: number, v: boolean) => void; current: () => string[] };
const TicksContext = createContext<Ticks | null>(null);

export function ProtocolTicksProvider({ steps, children }: { steps: string[]; children: React.ReactNode }) {
  const [done, setDone] = useState<boolean[]>(() => steps.map(() => false));
  const ref = useRef(done);
  ref.current = done;
  const value: Ticks = {
    steps, done,
    set: (i, v) => setDone((d) => d.map((x, j) => (j === i ? v : x))),
    current: () => steps.filter((_, i) => ref.current[i]),
  };
  return <TicksContext.Provider value={value}>{children}</TicksContext.Provider>;
}

/** null outside a provider (a trial without a protocol): uploads then record no protocol. */
export function useProtocolTicks(): Ticks | null {
  return useContext(TicksContext);
}
