// Trial status as text plus a quiet colour: the word carries the meaning, the colour only helps.
const STYLE = {
  draft: "border-iron-400 text-iron-700 dark:text-iron-200",
  running: "border-verdigris-600 bg-verdigris-50 text-verdigris-800",
  concluded: "border-iron-700 bg-iron-100 text-iron-800",
} as const;
const LABEL = { draft: "draft", running: "running", concluded: "concluded · locked" } as const;

export function StatusBadge({ status }: { status: keyof typeof STYLE }) {
  return <span className={`inline-block rounded-full border px-2 py-0.5 text-xs font-medium whitespace-nowrap ${STYLE[status]}`}>{LABEL[status]}</span>;
}
