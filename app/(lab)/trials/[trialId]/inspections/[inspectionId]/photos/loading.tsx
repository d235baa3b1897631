export default function Loading() {
  return <p className="muted" role="status">Loading the inspection&apos;s photos…</p>;
}
