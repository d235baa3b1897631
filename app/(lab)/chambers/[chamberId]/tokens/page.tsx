import Link from "next/link";
import { getChamber, listChamberTokens } from "@/db/queries/chambers";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { appUrl } from "@/lib/mail/send";
import { formatDateTime } from "@/lib/format";
import { MAX_API_READINGS } from "@/lib/validation/chambers";
import { CreateTokenForm, RevokeTokenButton } from "@/components/chambers/token-forms";
import { EmptyState } from "@/components/ui/empty-state";
import { orNotFound } from "@/lib/auth/not-found";

export const metadata = { title: "Logger tokens" };

export default async function TokensPage({ params }: { params: Promise<{ chamberId: string }> }) {
  const ctx = await labPage("/chambers/[chamberId]/tokens");
  const { chamberId } = await params;
  const chamber = await getChamber({ labId: ctx.labId, chamberId }).catch(orNotFound);
  if (!can(ctx.role, "chambers.tokens")) {
    return <p role="alert" className="panel p-4 text-sm">Your role ({ctx.role}) cannot manage logger tokens; ask a lead or researcher.</p>;
  }
  const tokens = await listChamberTokens({ labId: ctx.labId, chamberId });
  const endpoint = appUrl(`/api/chambers/${chamber.id}/readings`);
  return (
    <div className="space-y-6 max-w-4xl">
      <p className="text-sm"><Link className="link" href="/chambers">Chambers</Link> / <Link className="link" href={`/chambers/${chamber.id}`}>{chamber.name}</Link> / logger tokens</p>
      <h1 className="text-2xl font-semibold">Logger tokens for {chamber.name}</h1>
      <p className="text-sm muted">A token lets one logger post readings to this chamber only, without signing in. Only a SHA-256 fingerprint is stored, so the token is shown once; revoke it when a logger is lost or retired.</p>
      <section className="panel p-4 space-y-3" aria-labelledby="new-token-h">
        <h2 id="new-token-h" className="font-semibold">New token</h2>
        <CreateTokenForm chamberId={chamber.id} />
      </section>
      <section className="panel p-4 space-y-3" aria-labelledby="tokens-h">
        <h2 id="tokens-h" className="font-semibold">Tokens</h2>
        {tokens.length === 0 ? <EmptyState text="No tokens yet. Create one above and put it in the logger's upload settings." /> : (
          <table className="data">
            <thead><tr><th>Label</th><th>Created</th><th>Last used</th><th>State</th></tr></thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td>{t.label}</td>
                  <td>{formatDateTime(t.createdAt)}</td>
                  <td>{t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "never"}</td>
                  <td>{t.revokedAt ? `revoked ${formatDateTime(t.revokedAt)}` : <RevokeTokenButton chamberId={chamber.id} tokenId={t.id} label={t.label} />}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="panel p-4 space-y-2 text-sm" aria-labelledby="api-h">
        <h2 id="api-h" className="font-semibold">How a logger posts</h2>
        <p><code className="font-mono">POST {endpoint}</code> with <code className="font-mono">Authorization: Bearer &lt;token&gt;</code> and a JSON body: one reading, or an array of up to {MAX_API_READINGS.toLocaleString("en")}.</p>
        <pre className="font-mono text-xs whitespace-pre-wrap break-all bg-iron-100/40 p-3 rounded-md">{`curl -X POST ${endpoint} \\
  -H "Authorization: Bearer $TOKEN" -H "Content-Type: application/json" \\
  -d '[{"takenAt":"2025-03-01T14:30:00Z","rhPercent":33.4,"tempC":21.2,"instrument":"logger-b"}]'`}</pre>
        <p>Fields: <code>takenAt</code> (ISO 8601 with zone), <code>rhPercent</code> (0–100), optional <code>tempC</code> (−60…90), <code>dewPointC</code>, <code>instrument</code> (default “logger”). A reading already stored for the same time and instrument is skipped. Answers: 201 with counts; 401 for a missing, unknown or revoked token; 404 when the token belongs to another chamber; 400 for malformed JSON; 422 with the offending fields.</p>
      </section>
    </div>
  );
}
