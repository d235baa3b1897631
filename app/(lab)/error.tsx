"use client";

export default function LabError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="panel p-6 space-y-3 max-w-xl" role="alert">
      <h1 className="text-lg font-semibold">This page could not be shown</h1>
      <p className="text-sm muted">Nothing you entered was changed. If the database or storage was restarting, trying again usually works.</p>
      {error.digest && <p className="text-xs muted">Reference: {error.digest}</p>}
      <button className="btn" onClick={reset}>Try again</button>
    </div>
  );
}
