// CSV as RFC 4180 and the Frictionless default dialect describe it: comma, double quotes doubled
// inside quoted cells, CRLF between records, UTF-8, a header row.

const NEEDS_QUOTES = /[",\r\n]|^\s|\s$/;

export function csvCell(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const lines = [header, ...rows].map((cells) => cells.map(csvCell).join(","));
  return `${lines.join("\r\n")}\r\n`;
}
