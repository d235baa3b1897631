"use client";
// The settings of a logger import: which column is which, how the file is laid out, and the zone,
// unit and date order its timestamps and temperatures use. Pre-filled from previewCsv's guesses.

export type MappingState = {
  delimiter: "," | ";" | "\t";
  skipLines: number;
  hasHeader: boolean;
  timeCol: string;
  timeCol2: string;
  rhCol: string;
  tempCol: string;
  dewCol: string;
  temperatureUnit: "C" | "F";
  dateFormat: "auto" | "iso" | "ymd" | "dmy" | "mdy";
  timeZone: string;
  instrument: string;
};

const ZONES = typeof Intl !== "undefined" && "supportedValuesOf" in Intl ? (Intl as unknown as { supportedValuesOf(k: string): string[] }).supportedValuesOf("timeZone") : [];

function Select({ id, label, value, onChange, options, hint }: { id: string; label: string; value: string; onChange: (v: string) => void; options: { value: string; label: string }[]; hint?: string }) {
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className="field" aria-describedby={hint ? `${id}-hint` : undefined}>
        {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
      </select>
      {hint && <p id={`${id}-hint`} className="text-xs muted">{hint}</p>}
    </div>
  );
}

export function CsvMappingFields({ m, setM, header, columnCount, text }: { m: MappingState; setM: (m: MappingState) => void; header: string[] | null; columnCount: number; text: string }) {
  const set = <K extends keyof MappingState>(k: K, v: MappingState[K]) => setM({ ...m, [k]: v });
  const cols = Array.from({ length: columnCount }, (_, i) => ({ value: String(i), label: header?.[i] ? `${i + 1}: ${header[i]}` : `Column ${i + 1}` }));
  const none = { value: "-1", label: "— none —" };
  const decimalComma = /\d,\d/.test(text.slice(0, 5000)) && m.delimiter !== ",";
  return (
    <fieldset className="panel p-3 grid gap-4 md:grid-cols-3">
      <legend className="text-sm font-semibold px-1">How to read the file</legend>
      <Select id="csv-time" label="Time column" value={m.timeCol} onChange={(v) => set("timeCol", v)} options={[none, ...cols]} />
      <Select id="csv-time2" label="Separate time-of-day column" value={m.timeCol2} onChange={(v) => set("timeCol2", v)} options={[none, ...cols]} hint="Only for loggers that split date and time." />
      <Select id="csv-rh" label="RH column (%RH)" value={m.rhCol} onChange={(v) => set("rhCol", v)} options={[none, ...cols]} />
      <Select id="csv-temp" label="Temperature column (optional)" value={m.tempCol} onChange={(v) => set("tempCol", v)} options={[none, ...cols]} />
      <Select id="csv-dew" label="Dew point column (optional)" value={m.dewCol} onChange={(v) => set("dewCol", v)} options={[none, ...cols]} />
      <Select id="csv-unit" label="Temperature unit" value={m.temperatureUnit} onChange={(v) => set("temperatureUnit", v as "C" | "F")}
        options={[{ value: "C", label: "°C" }, { value: "F", label: "°F (converted to °C)" }]} />
      <Select id="csv-delim" label="Delimiter" value={m.delimiter} onChange={(v) => set("delimiter", v as MappingState["delimiter"])}
        options={[{ value: ",", label: "Comma ," }, { value: ";", label: "Semicolon ;" }, { value: "\t", label: "Tab" }]}
        hint={decimalComma ? "Decimal commas (21,5) detected; they are read as decimals." : "Decimal commas (21,5) are read as decimals when the delimiter is not a comma."} />
      <div className="space-y-1">
        <label htmlFor="csv-skip" className="block text-sm font-medium">Lines before the header</label>
        <input id="csv-skip" type="number" min={0} max={1000} value={m.skipLines} onChange={(e) => set("skipLines", Math.max(0, Math.min(1000, Number(e.target.value) || 0)))} className="field" aria-describedby="csv-skip-hint" />
        <p id="csv-skip-hint" className="text-xs muted">Logger metadata lines to skip.</p>
      </div>
      <label className="flex items-center gap-2 text-sm pt-6">
        <input type="checkbox" checked={m.hasHeader} onChange={(e) => set("hasHeader", e.target.checked)} /> First row after them is a header
      </label>
      <Select id="csv-datefmt" label="Date order" value={m.dateFormat} onChange={(v) => set("dateFormat", v as MappingState["dateFormat"])}
        options={[{ value: "auto", label: "Automatic (year first, else day first)" }, { value: "iso", label: "ISO 8601" }, { value: "ymd", label: "Year-month-day" }, { value: "dmy", label: "Day/month/year" }, { value: "mdy", label: "Month/day/year" }]} />
      <div className="space-y-1">
        <label htmlFor="csv-zone" className="block text-sm font-medium">Logger time zone</label>
        <input id="csv-zone" list="csv-zones" value={m.timeZone} onChange={(e) => set("timeZone", e.target.value)} className="field" aria-describedby="csv-zone-hint" />
        <datalist id="csv-zones">{["UTC", ...ZONES].map((z) => <option key={z} value={z} />)}</datalist>
        <p id="csv-zone-hint" className="text-xs muted">For times written without an offset: an IANA zone (Europe/Berlin) or an offset (+02:00).</p>
      </div>
      <div className="space-y-1">
        <label htmlFor="csv-instrument" className="block text-sm font-medium">Instrument</label>
        <input id="csv-instrument" value={m.instrument} onChange={(e) => set("instrument", e.target.value)} className="field" maxLength={80} aria-describedby="csv-instrument-hint" />
        <p id="csv-instrument-hint" className="text-xs muted">Readings are kept per instrument; a time already stored for it is skipped.</p>
      </div>
    </fieldset>
  );
}
