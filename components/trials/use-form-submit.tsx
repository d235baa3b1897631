"use client";
// Submit a form to a server action without React's automatic form reset: controlled checkboxes
// (specimen picks, scorer picks) would otherwise show unchecked while their state still says checked.
import { useTransition } from "react";

export function useFormSubmit(dispatch: (fd: FormData) => void) {
  const [, startTransition] = useTransition();
  return (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    startTransition(() => dispatch(fd));
  };
}

export function PendingButton({ pending, children, pendingText = "Saving…" }: { pending: boolean; children: React.ReactNode; pendingText?: string }) {
  return <button type="submit" className="btn" disabled={pending} aria-busy={pending}>{pending ? pendingText : children}</button>;
}
