"use client";

export function PrintButton({ label = "Print the table" }: { label?: string }) {
  return <button type="button" className="btn-quiet no-print" onClick={() => window.print()}>{label}</button>;
}
