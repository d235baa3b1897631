"use client";
// CSV import: the file is read and checked in the browser (same parser and schema as the server)
// for a preview; the server checks again, adds the lab's existing labels, and writes all or nothing.
import { useActionState, useMemo, useState } from "react";
import Link from "next/link";
import { importSpecimensAction, type ImportState } from "@/app/_actions/specimens";
import { FormMessage, SubmitButton } from "@/components/ui/form";
import { CSV_COLUMNS, MATERIAL_CLASS_LABELS, MAX_IMPORT_BYTES, parseSpecimenCsv, type CsvRowError } from "@/lib/validation/specimens";

const PREVIEW_ROWS = 15;

function ErrorList({ errors, title }: { errors: CsvRowError[]; title: string }) {
  if (!errors.length) return null;
  return (
    <section className="panel p-3 space-y-2" aria-labelledby="csv-errors-h">
      <h3 id="csv-errors-h" className="font-semibold text-rust-700">{title}</h3>
      <ul className="text-sm space-y-1 max-h-72 overflow-auto">
        {errors.slice(0, 200).map((e, i) => (
          <li key={i}><span className="font-mono">{e.line > 0 ? `line ${e.line}` : "file"}</span>{e.field ? <> · <span className="font-mono">{e.field}</span></> : null}: {e.message}</li>
        ))}
        {errors.length > 200 && <li className="muted">…and {errors.length - 200} more.</li>}
      </ul>
    </section>
  );
}

export function SpecimenImport() {
  const [state, action] = useActionState(importSpecimensAction, undefined);
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const preview = useMemo(() => (file ? parseSpecimenCsv(file.text) : null), [file]);
  const serverErrors = (state?.data as ImportState | undefined)?.errors ?? [];
  const created = state?.ok ? (state.data as ImportState | undefined)?.created : undefined;

  async function onFile(f: File | undefined) {
    setReadError(null);
    setFile(null);
    if (!f) return;
    if (f.size > MAX_IMPORT_BYTES) {
      setReadError("The file is larger than 1.5 MB; split it into several files.");
      return;
    }
    setFile({ name: f.name, text: await f.text() });
  }

  return (
    <div className="space-y-4">
      <div className="space-y-1">
        <label htmlFor="csv-file" className="block text-sm font-medium">CSV file</label>
        <input id="csv-file" type="file" accept=".csv,text/csv" className="field" aria-describedby="csv-hint" onChange={(e) => onFile(e.target.files?.[0])} />
        <p id="csv-hint" className="text-xs muted">
          First line: the column names <span className="font-mono">{CSV_COLUMNS.join(", ")}</span>. Only label and material_class are required;
          material_class is one of {Object.values(MATERIAL_CLASS_LABELS).join(", ")}. Mass in grams.
        </p>
        {readError && <p role="alert" className="text-sm text-rust-600">{readError}</p>}
      </div>

      {preview && file && (
        <section className="space-y-2" aria-labelledby="preview-h">
          <h2 id="preview-h" className="font-semibold">Preview of {file.name}</h2>
          <p className="text-sm" role="status">
            {preview.total} row{preview.total === 1 ? "" : "s"}: {preview.rows.length} valid, {preview.errors.length} problem{preview.errors.length === 1 ? "" : "s"} found here.
            {preview.errors.length === 0 && " Labels already in the lab are checked when you import."}
          </p>
          {preview.rows.length > 0 && (
            <div className="panel overflow-x-auto">
              <table className="data">
                <caption className="sr-only">First rows of the file</caption>
                <thead><tr><th scope="col">Line</th><th scope="col">Label</th><th scope="col">Material class</th><th scope="col">Find name</th><th scope="col">Mass (g)</th><th scope="col">Preparation</th></tr></thead>
                <tbody>
                  {preview.rows.slice(0, PREVIEW_ROWS).map((r) => (
                    <tr key={r.line}><td className="font-mono">{r.line}</td><td>{r.value.label}</td><td>{MATERIAL_CLASS_LABELS[r.value.materialClass]}</td><td>{r.value.findName}</td><td>{r.value.massG ?? "—"}</td><td>{r.value.surfacePrep}</td></tr>
                  ))}
                </tbody>
              </table>
              {preview.rows.length > PREVIEW_ROWS && <p className="text-xs muted p-2">…and {preview.rows.length - PREVIEW_ROWS} more valid rows.</p>}
            </div>
          )}
          <ErrorList errors={preview.errors} title="Fix these lines first (nothing is imported while any row is wrong)" />
        </section>
      )}

      <form action={action} className="space-y-3">
        <input type="hidden" name="csv" value={file?.text ?? ""} />
        <FormMessage state={state} />
        <ErrorList errors={serverErrors} title="The server found these problems" />
        {created !== undefined && <Link className="link" href="/specimens">Back to the specimen list</Link>}
        {!state?.ok && preview && preview.errors.length === 0 && (
          <SubmitButton pendingText="Importing…">{`Import ${preview.rows.length} specimens`}</SubmitButton>
        )}
      </form>
    </div>
  );
}
