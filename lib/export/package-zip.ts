// A Frictionless data package as one zip: datapackage.json, the CSV tables under data/, a README.
import { createHash } from "node:crypto";
import JSZip from "jszip";
import { buildDataPackage, type DataPackage } from "./datapackage";
import { tableToCsv, type TableSpec } from "./table-schema";

export interface PackageTable {
  spec: TableSpec;
  rows: readonly object[];
}

export async function buildPackageZip(input: {
  name: string;
  title: string;
  description: string;
  created: Date;
  keywords?: string[];
  readme: string;
  tables: readonly PackageTable[];
}): Promise<{ zip: Uint8Array; descriptor: DataPackage }> {
  const zip = new JSZip();
  const resources = input.tables.map(({ spec, rows }) => {
    const bytes = Buffer.from(tableToCsv(spec, rows), "utf8");
    const path = `data/${spec.name}.csv`;
    zip.file(path, bytes, { date: input.created });
    return { spec, path, bytes: bytes.length, sha256: createHash("sha256").update(bytes).digest("hex") };
  });
  const descriptor = buildDataPackage({
    name: input.name, title: input.title, description: input.description, created: input.created,
    keywords: input.keywords, resources,
  });
  zip.file("datapackage.json", `${JSON.stringify(descriptor, null, 2)}\n`, { date: input.created });
  zip.file("README.md", input.readme, { date: input.created });
  const out = await zip.generateAsync({ type: "uint8array", compression: "DEFLATE", compressionOptions: { level: 6 } });
  return { zip: out, descriptor };
}
