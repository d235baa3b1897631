import Link from "next/link";

export default function NotFound() {
  return (
    <main className="max-w-xl mx-auto p-8 space-y-3">
      <h1 className="text-xl font-semibold">Not found</h1>
      <p className="muted">This page or record does not exist in your lab.</p>
      <Link className="link" href="/">Back to the lab home</Link>
    </main>
  );
}
