"use client";
// A status line above the recorded photos: a moved or deleted photo leaves the list, so what happened
// to it is said here rather than on its (gone) card.
import { createContext, useCallback, useContext, useState } from "react";

const NoticeContext = createContext<(message: string) => void>(() => undefined);

export function usePhotoNotice() {
  return useContext(NoticeContext);
}

export function PhotoNotices({ children }: { children: React.ReactNode }) {
  const [message, setMessage] = useState("");
  const announce = useCallback((m: string) => setMessage(m), []);
  return (
    <NoticeContext.Provider value={announce}>
      <p role="status" aria-live="polite" className={message ? "text-sm rounded-md px-3 py-2 bg-verdigris-50 text-verdigris-800 dark:bg-verdigris-900/40 dark:text-verdigris-100" : "sr-only"} data-testid="photo-notice">{message}</p>
      {children}
    </NoticeContext.Provider>
  );
}
