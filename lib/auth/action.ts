// The one wrapper for server actions: session → lab membership → permission → zod parse → handler.
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { AppError, toAppError, type ErrorCode } from "./errors";
import { currentIdentity, requireLab, type LabContext, type SessionIdentity } from "./context";
import type { Permission } from "./permissions";

export type FieldErrors = Record<string, string[] | undefined>;
export type ActionState<T = unknown> = {
  ok?: boolean;
  /** On failure, the same code a route handler maps to its HTTP status (lib/auth/errors). */
  code?: ErrorCode;
  message?: string;
  errors?: FieldErrors;
  values?: Record<string, string>;
  data?: T;
};

/** FormData → plain object; repeated keys become arrays, files are dropped (uploads go to S3). */
export function formToObject(fd: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of new Set(fd.keys())) {
    if (key.startsWith("$ACTION")) continue;
    const all = fd.getAll(key).filter((v) => typeof v === "string");
    out[key] = all.length > 1 || key.endsWith("[]") ? all : all[0];
  }
  return out;
}

function echoValues(input: Record<string, unknown>): Record<string, string> {
  const v: Record<string, string> = {};
  for (const [k, val] of Object.entries(input)) {
    if (/password|token/i.test(k)) continue;
    if (typeof val === "string") v[k] = val;
    else if (Array.isArray(val)) v[k] = val.join("\n");
  }
  return v;
}

/** The testable core: runs the chain for a given identity and input object. */
export async function runLabAction<S extends z.ZodType, T>(
  identity: SessionIdentity,
  permission: Permission,
  schema: S,
  input: Record<string, unknown>,
  handler: (ctx: LabContext, data: z.infer<S>) => Promise<ActionState<T> | void>,
): Promise<ActionState<T>> {
  try {
    const ctx = await requireLab(identity, permission);
    const parsed = schema.safeParse(input);
    if (!parsed.success) {
      return {
        ok: false,
        code: "invalid",
        message: "Please correct the highlighted fields. Nothing was saved.",
        errors: z.flattenError(parsed.error).fieldErrors as FieldErrors,
        values: echoValues(input),
      };
    }
    const result = await handler(ctx, parsed.data);
    return { ok: true, ...(result ?? {}) };
  } catch (err) {
    // redirect() and notFound() from next/navigation throw special errors that must pass through.
    if (err && typeof err === "object" && "digest" in err && typeof (err as { digest: unknown }).digest === "string"
      && /^NEXT_(REDIRECT|HTTP_ERROR_FALLBACK|NOT_FOUND)/.test((err as { digest: string }).digest)) {
      throw err;
    }
    const e = toAppError(err);
    return { ok: false, code: e.code, message: e.message, errors: e.fieldErrors, values: echoValues(input) };
  }
}

export type LabActionFn<T> = ((prev: ActionState<T> | undefined, formData: FormData) => Promise<ActionState<T>>) & {
  /** The same chain for an explicit identity and input object (tests, scripts). Not reachable from a client. */
  withIdentity: (identity: SessionIdentity, input: Record<string, unknown>) => Promise<ActionState<T>>;
  permission: Permission;
};

/** Define a server action for useActionState: `(prevState, formData) => state`. */
export function labAction<S extends z.ZodType, T = unknown>(
  permission: Permission,
  schema: S,
  handler: (ctx: LabContext, data: z.infer<S>) => Promise<ActionState<T> | void>,
): LabActionFn<T> {
  const action = async (_prev: ActionState<T> | undefined, formData: FormData): Promise<ActionState<T>> => {
    return runLabAction(await currentIdentity(), permission, schema, formToObject(formData), handler);
  };
  return Object.assign(action, {
    withIdentity: (identity: SessionIdentity, input: Record<string, unknown>) => runLabAction(identity, permission, schema, input, handler),
    permission,
  });
}

/** revalidatePath that is a no-op outside a Next request (tests and scripts call actions directly). */
export function revalidate(path: string) {
  try {
    revalidatePath(path);
  } catch (err) {
    if (!/static generation store missing|Invariant/i.test(err instanceof Error ? err.message : "")) throw err;
  }
}

export { AppError };
