// For pages: a query's "not-found" AppError (a missing row, or another lab's) renders the not-found page;
// any other error goes on to the error boundary. Use as `await getX(…).catch(orNotFound)`.
import { notFound } from "next/navigation";
import { AppError } from "./errors";

export function orNotFound(err: unknown): never {
  if (err instanceof AppError && err.code === "not-found") notFound();
  throw err;
}
