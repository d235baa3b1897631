// POST /api/chambers/[chamberId]/readings — a logger posts readings with its chamber token
// (Authorization: Bearer <token>): one reading or an array of up to 5,000, validated by zod.
// No session and no cookies: the token is the credential, so no same-origin check applies.
import { NextResponse } from "next/server";
import { authenticateChamberToken, postReadingsWithToken } from "@/db/queries/readings";
import { readBodyText } from "@/lib/auth/body";
import { STATUS, toAppError } from "@/lib/auth/errors";
import { apiReadingsBodySchema } from "@/lib/validation/chambers";

const MAX_BODY_BYTES = 2_000_000;

function fail(status: number, code: string, message: string, extra: Record<string, unknown> = {}) {
  const headers: Record<string, string> = status === 401 ? { "WWW-Authenticate": 'Bearer realm="rustline-logger"' } : {};
  return NextResponse.json({ error: { code, message, ...extra } }, { status, headers });
}

export async function POST(req: Request, { params }: { params: Promise<{ chamberId: string }> }) {
  try {
    const { chamberId } = await params;
    const auth = /^Bearer\s+(\S+)\s*$/i.exec(req.headers.get("authorization") ?? "");
    if (!auth) return fail(401, "unauthenticated", "Send the chamber's logger token as 'Authorization: Bearer <token>'.");
    await authenticateChamberToken({ token: auth[1], chamberId });

    const text = await readBodyText(req, MAX_BODY_BYTES, "The request body is larger than 2 MB; send at most 5,000 readings per request.");
    let raw: unknown;
    try {
      raw = JSON.parse(text);
    } catch {
      return fail(400, "invalid-json", "The request body is not valid JSON. Send one reading object or an array of them.");
    }
    const parsed = apiReadingsBodySchema.safeParse(raw);
    if (!parsed.success) {
      const issues = parsed.error.issues.slice(0, 20).map((i) => ({ path: formatPath(i.path), message: i.message }));
      const first = issues[0];
      return fail(422, "invalid", `The readings have invalid fields${first ? `: ${first.path ? `${first.path}: ` : ""}${first.message}` : ""}.`, { issues, issueCount: parsed.error.issues.length });
    }
    const result = await postReadingsWithToken({ token: auth[1], chamberId, body: parsed.data });
    return NextResponse.json(result, { status: 201 });
  } catch (err) {
    const e = toAppError(err);
    return fail(STATUS[e.code], e.code, e.message);
  }
}

function formatPath(path: readonly PropertyKey[]): string {
  return path.map((p, i) => (typeof p === "number" ? `[${p}]` : `${i ? "." : ""}${String(p)}`)).join("");
}
