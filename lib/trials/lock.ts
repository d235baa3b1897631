// The lock of a concluded trial, with one message, whoever writes (pages, actions, routes, jobs).
import { AppError } from "@/lib/auth/errors";
import { formatDate } from "@/lib/format";
import type { TrialStatus } from "./access";

type LockFields = { status: TrialStatus; concludedAt: Date | null };

export function lockedError(t: Pick<LockFields, "concludedAt">) {
  const when = t.concludedAt ? ` on ${formatDate(t.concludedAt)}` : "";
  return new AppError("locked", `This trial was concluded${when} and its record is locked. Only notes can be added.`);
}

/** Refuses a concluded trial; `need` also asks for the draft (design) or running (records) stage. */
export function assertWritable(t: LockFields, need?: "draft" | "running") {
  if (t.status === "concluded") throw lockedError(t);
  if (need === "draft" && t.status !== "draft") throw new AppError("conflict", "The design and allocation are fixed once a trial is running. Move specimens or add notes instead.");
  if (need === "running" && t.status !== "running") throw new AppError("conflict", "This needs a running trial; start it first.");
}
