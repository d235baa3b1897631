// The same chain for route handlers, with JSON bodies parsed by zod and errors as JSON.
import { NextResponse } from "next/server";
import { z } from "zod";
import { readBodyText } from "./body";
import { AppError, STATUS, toAppError } from "./errors";
import { currentIdentity, requireLab, type LabContext } from "./context";
import type { Permission } from "./permissions";

export function jsonError(err: unknown) {
  const e = toAppError(err);
  return NextResponse.json({ error: { code: e.code, message: e.message, fields: e.fieldErrors } }, { status: STATUS[e.code] });
}

export const MAX_JSON_BYTES = 1_000_000;

export async function readJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  const text = await readBodyText(req, MAX_JSON_BYTES, "The request body is larger than 1 MB.");
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new AppError("invalid", "The request body is not valid JSON.");
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    throw new AppError("invalid", "The request body has invalid fields.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  return parsed.data;
}

// Cookie-authenticated writes must come from our own origin (CSRF protection).
export function checkSameOrigin(req: Request) {
  if (req.method === "GET" || req.method === "HEAD") return;
  const origin = req.headers.get("origin");
  if (!origin) return; // non-browser clients send no Origin; they cannot ride a browser cookie
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  if (!host || new URL(origin).host !== host) throw new AppError("forbidden", "Cross-site request refused.");
}

type Handler<P> = (ctx: LabContext, req: Request, params: P) => Promise<Response>;

export function labRoute<P = Record<string, string>>(permission: Permission, handler: Handler<P>) {
  const route = async (req: Request, routeCtx: { params: Promise<P> }) => {
    try {
      checkSameOrigin(req);
      const ctx = await requireLab(await currentIdentity(), permission);
      return await handler(ctx, req, await routeCtx.params);
    } catch (err) {
      return jsonError(err);
    }
  };
  // The authorization matrix test reads this to know what each handler requires.
  return Object.assign(route, { permission });
}
