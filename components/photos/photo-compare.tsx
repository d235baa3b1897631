"use client";
// Two dates of one specimen, side by side or overlaid with a divider. ←/→ step the later photo
// through the dates, Shift+←/→ the earlier one; every control is labelled for screen readers.
import { useState, type KeyboardEvent } from "react";

export type CompareEntry = { key: string; label: string; alt: string; src: string; score: string; aspect: number };

export function PhotoCompare({ entries, title }: { entries: CompareEntry[]; title: string }) {
  const [a, setA] = useState(0);
  const [b, setB] = useState(entries.length - 1);
  const [mode, setMode] = useState<"side" | "slider">("side");
  const [divider, setDivider] = useState(50);
  if (entries.length < 2) {
    return <p className="text-sm muted">Comparison needs previews from two inspections; {entries.length === 1 ? "there is one so far" : "there are none yet"}.</p>;
  }
  const clamp = (i: number) => Math.max(0, Math.min(entries.length - 1, i));
  const step = (which: "a" | "b", delta: number) => (which === "a" ? setA((i) => clamp(i + delta)) : setB((i) => clamp(i + delta)));
  const onKey = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key !== "ArrowLeft" && e.key !== "ArrowRight") return;
    e.preventDefault();
    step(e.shiftKey ? "a" : "b", e.key === "ArrowLeft" ? -1 : 1);
  };
  const A = entries[a];
  const B = entries[b];
  const id = title.replace(/[^a-z0-9]+/gi, "-").toLowerCase();
  const aspect = B.aspect || A.aspect || 4 / 3;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-3 items-end">
        <div>
          <label htmlFor={`${id}-a`} className="block text-xs font-medium">Left / under</label>
          <select id={`${id}-a`} className="field py-1" value={a} onChange={(e) => setA(Number(e.target.value))}>
            {entries.map((en, i) => <option key={en.key} value={i}>{en.label}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor={`${id}-b`} className="block text-xs font-medium">Right / over</label>
          <select id={`${id}-b`} className="field py-1" value={b} onChange={(e) => setB(Number(e.target.value))}>
            {entries.map((en, i) => <option key={en.key} value={i}>{en.label}</option>)}
          </select>
        </div>
        <fieldset className="flex gap-3 text-sm">
          <legend className="text-xs font-medium">View</legend>
          <label className="flex items-center gap-1"><input type="radio" name={`${id}-mode`} checked={mode === "side"} onChange={() => setMode("side")} /> Side by side</label>
          <label className="flex items-center gap-1"><input type="radio" name={`${id}-mode`} checked={mode === "slider"} onChange={() => setMode("slider")} /> Slider overlay</label>
        </fieldset>
        <div className="flex gap-1">
          <button type="button" className="btn-quiet text-sm" onClick={() => step("b", -1)} disabled={b === 0} aria-label="Step the right-hand photo to the previous date">← Earlier</button>
          <button type="button" className="btn-quiet text-sm" onClick={() => step("b", 1)} disabled={b === entries.length - 1} aria-label="Step the right-hand photo to the next date">Later →</button>
        </div>
      </div>
      <div tabIndex={0} role="group" onKeyDown={onKey} className="rounded-md focus-visible:outline-2"
        aria-label={`${title}: ${A.label} against ${B.label}. Left and right arrow keys step the right-hand photo through the dates; with Shift, the left-hand one.`}
        aria-describedby={`${id}-help`}>
        {mode === "side" ? (
          <div className="grid gap-2 sm:grid-cols-2">
            {[A, B].map((en, i) => (
              <figure key={`${i}-${en.key}`} className="space-y-1">
                {/* eslint-disable-next-line @next/next/no-img-element -- signed storage URLs */}
                <img src={en.src} alt={en.alt} className="w-full h-auto rounded bg-iron-900 object-contain" style={{ aspectRatio: aspect }} />
                <figcaption className="text-xs"><span className="font-medium">{en.label}</span> · {en.score}</figcaption>
              </figure>
            ))}
          </div>
        ) : (
          <figure className="space-y-1 max-w-3xl">
            <div className="relative w-full overflow-hidden rounded bg-iron-900" style={{ aspectRatio: aspect }}>
              {/* eslint-disable-next-line @next/next/no-img-element -- signed storage URLs */}
              <img src={A.src} alt={A.alt} className="absolute inset-0 w-full h-full object-contain" />
              {/* eslint-disable-next-line @next/next/no-img-element -- signed storage URLs */}
              <img src={B.src} alt={B.alt} className="absolute inset-0 w-full h-full object-contain" style={{ clipPath: `inset(0 0 0 ${divider}%)` }} />
              <div aria-hidden="true" className="absolute inset-y-0 w-0.5 bg-white/80" style={{ left: `${divider}%` }} />
            </div>
            <figcaption className="text-xs flex flex-wrap justify-between gap-2">
              <span><span className="font-medium">Left: {A.label}</span> · {A.score}</span>
              <span><span className="font-medium">Right: {B.label}</span> · {B.score}</span>
            </figcaption>
            <label className="block text-xs font-medium" htmlFor={`${id}-divider`}>Divider position (% from the left)</label>
            <input id={`${id}-divider`} type="range" min={0} max={100} value={divider} onChange={(e) => setDivider(Number(e.target.value))} className="w-full" />
          </figure>
        )}
      </div>
      <p id={`${id}-help`} className="text-xs muted">Focus the photos and use ← / → to step the right-hand photo through the dates (Shift + ← / → for the left-hand one).</p>
      <p className="sr-only" aria-live="polite">Comparing {A.label} with {B.label}.</p>
    </div>
  );
}
