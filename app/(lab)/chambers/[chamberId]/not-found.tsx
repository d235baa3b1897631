import Link from "next/link";

export default function ChamberNotFound() {
  return (
    <div className="panel p-6 space-y-2 max-w-xl" role="alert">
      <h1 className="text-lg font-semibold">No such chamber</h1>
      <p className="text-sm muted">It does not exist in the lab you are working in. If it belongs to another of your labs, switch lab first.</p>
      <Link className="link text-sm" href="/chambers">All chambers</Link>
    </div>
  );
}
