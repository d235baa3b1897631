// Frictionless Data Package descriptors (datapackage.json, spec v1 with the tabular profiles):
// build one for our CSV tables, and check any descriptor against the spec's required parts and the
// cross-references a JSON Schema cannot express (unique names, keys naming existing fields). The tests
// also check descriptors against the official profile JSON with ajv (tests/support/datapackage-profile.ts).
import { FIELD_TYPES, formatDateTime, schemaOf, type TableSchema, type TableSpec } from "./table-schema";

export interface DataResource {
  name: string;
  path: string;
  profile: "tabular-data-resource";
  title?: string;
  description?: string;
  format: "csv";
  mediatype: "text/csv";
  encoding: "utf-8";
  bytes?: number;
  /** "sha256:<hex>" — the spec's hash form for a non-MD5 algorithm. */
  hash?: string;
  schema: TableSchema;
}

export interface DataPackage {
  profile: "tabular-data-package";
  name: string;
  title?: string;
  description?: string;
  version?: string;
  created?: string;
  keywords?: string[];
  resources: DataResource[];
}

/** Lower case, digits, ".", "_" and "-": the spec's rule for package and resource names. */
export const NAME_PATTERN = /^[a-z0-9._-]+$/;

/** A package name from free text, e.g. a trial title. */
export function toPackageName(text: string, fallback = "rustline-trial"): string {
  const name = text.normalize("NFKD").replace(/[\u0300-\u036f]/g, "").toLowerCase()
    .replace(/[^a-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 80);
  return name || fallback;
}

export function buildDataPackage(input: {
  name: string;
  title?: string;
  description?: string;
  created?: Date;
  keywords?: string[];
  resources: { spec: TableSpec; path: string; bytes?: number; sha256?: string }[];
}): DataPackage {
  return {
    profile: "tabular-data-package",
    name: input.name,
    ...(input.title ? { title: input.title } : {}),
    ...(input.description ? { description: input.description } : {}),
    ...(input.created ? { created: formatDateTime(input.created) } : {}),
    ...(input.keywords ? { keywords: input.keywords } : {}),
    resources: input.resources.map(({ spec, path, bytes, sha256 }) => ({
      name: spec.name,
      path,
      profile: "tabular-data-resource",
      title: spec.title,
      description: spec.description,
      format: "csv",
      mediatype: "text/csv",
      encoding: "utf-8",
      ...(bytes !== undefined ? { bytes } : {}),
      ...(sha256 ? { hash: `sha256:${sha256}` } : {}),
      schema: schemaOf(spec),
    })),
  };
}

export interface DescriptorProblem {
  /** Where in the descriptor, e.g. "resources[2].schema.fields[0].type". */
  at: string;
  message: string;
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const asList = (v: unknown): unknown[] => (Array.isArray(v) ? v : [v]);

// A path is a POSIX relative path inside the package, or a URL; never absolute, never climbing out.
function badPath(p: unknown): string | null {
  if (typeof p !== "string" || p === "") return "must be a non-empty string";
  if (/^https?:\/\//.test(p)) return null;
  if (p.startsWith("/") || /^[a-zA-Z]:/.test(p) || p.includes("\\")) return "must be a relative POSIX path";
  if (p.split("/").includes("..")) return "must not contain '..'";
  return null;
}

function checkSchema(schema: unknown, at: string, problems: DescriptorProblem[]): Set<string> {
  const names = new Set<string>();
  if (!isObj(schema)) {
    problems.push({ at, message: "schema must be an object" });
    return names;
  }
  if (!Array.isArray(schema.fields) || schema.fields.length === 0) {
    problems.push({ at: `${at}.fields`, message: "fields must be a non-empty array" });
    return names;
  }
  schema.fields.forEach((f, i) => {
    const fat = `${at}.fields[${i}]`;
    if (!isObj(f)) return problems.push({ at: fat, message: "field must be an object" });
    if (typeof f.name !== "string" || f.name === "") problems.push({ at: `${fat}.name`, message: "name is required" });
    else if (names.has(f.name)) problems.push({ at: `${fat}.name`, message: `duplicate field name "${f.name}"` });
    else names.add(f.name);
    if (typeof f.type !== "string") problems.push({ at: `${fat}.type`, message: "type is required" });
    else if (!(FIELD_TYPES as readonly string[]).includes(f.type)) {
      problems.push({ at: `${fat}.type`, message: `type "${f.type}" is not a Table Schema type` });
    }
    if (f.format !== undefined && typeof f.format !== "string") problems.push({ at: `${fat}.format`, message: "format must be a string" });
    if (f.constraints !== undefined && !isObj(f.constraints)) problems.push({ at: `${fat}.constraints`, message: "constraints must be an object" });
  });
  if (schema.primaryKey !== undefined) {
    for (const k of asList(schema.primaryKey)) {
      if (typeof k !== "string" || !names.has(k)) problems.push({ at: `${at}.primaryKey`, message: `primary key "${String(k)}" is not a field` });
    }
  }
  return names;
}

function checkForeignKeys(resource: Obj, at: string, fieldsOf: Map<string, Set<string>>, problems: DescriptorProblem[]) {
  const schema = resource.schema as Obj | undefined;
  if (!isObj(schema) || schema.foreignKeys === undefined) return;
  if (!Array.isArray(schema.foreignKeys)) return problems.push({ at: `${at}.schema.foreignKeys`, message: "foreignKeys must be an array" });
  const own = fieldsOf.get(String(resource.name)) ?? new Set<string>();
  schema.foreignKeys.forEach((fk, i) => {
    const fat = `${at}.schema.foreignKeys[${i}]`;
    if (!isObj(fk) || !isObj(fk.reference)) return problems.push({ at: fat, message: "needs fields and a reference {resource, fields}" });
    const local = asList(fk.fields);
    const remote = asList(fk.reference.fields);
    for (const f of local) if (typeof f !== "string" || !own.has(f)) problems.push({ at: `${fat}.fields`, message: `"${String(f)}" is not a field of this resource` });
    if (local.length !== remote.length) problems.push({ at: fat, message: "fields and reference.fields differ in length" });
    const target = fk.reference.resource === "" ? String(resource.name) : fk.reference.resource;
    const targetFields = typeof target === "string" ? fieldsOf.get(target) : undefined;
    if (!targetFields) return problems.push({ at: `${fat}.reference.resource`, message: `no resource named "${String(target)}"` });
    for (const f of remote) if (typeof f !== "string" || !targetFields.has(f)) problems.push({ at: `${fat}.reference.fields`, message: `"${String(f)}" is not a field of ${String(target)}` });
  });
}

/** Problems with a descriptor against the Data Package / Tabular Data Package specs; [] when valid. */
export function validateDataPackage(descriptor: unknown): DescriptorProblem[] {
  const problems: DescriptorProblem[] = [];
  if (!isObj(descriptor)) return [{ at: "", message: "the descriptor must be a JSON object" }];
  if (typeof descriptor.name !== "string" || !NAME_PATTERN.test(descriptor.name)) {
    problems.push({ at: "name", message: "name is required: lower case letters, digits, '.', '_' or '-'" });
  }
  const tabular = descriptor.profile === "tabular-data-package";
  if (descriptor.profile !== undefined && typeof descriptor.profile !== "string") problems.push({ at: "profile", message: "profile must be a string" });
  if (!Array.isArray(descriptor.resources) || descriptor.resources.length === 0) {
    problems.push({ at: "resources", message: "resources must be a non-empty array" });
    return problems;
  }
  const fieldsOf = new Map<string, Set<string>>();
  const seen = new Set<string>();
  descriptor.resources.forEach((r, i) => {
    const at = `resources[${i}]`;
    if (!isObj(r)) return problems.push({ at, message: "a resource must be an object" });
    if (typeof r.name !== "string" || !NAME_PATTERN.test(r.name)) problems.push({ at: `${at}.name`, message: "name is required: lower case letters, digits, '.', '_' or '-'" });
    else if (seen.has(r.name)) problems.push({ at: `${at}.name`, message: `duplicate resource name "${r.name}"` });
    else seen.add(r.name);
    const hasPath = r.path !== undefined;
    if (hasPath === (r.data !== undefined)) problems.push({ at, message: "a resource needs exactly one of path or data" });
    if (hasPath) {
      const paths = asList(r.path);
      if (paths.length === 0) problems.push({ at: `${at}.path`, message: "path must not be an empty array" });
      paths.forEach((p) => { const bad = badPath(p); if (bad) problems.push({ at: `${at}.path`, message: bad }); });
    }
    if (r.mediatype !== undefined && (typeof r.mediatype !== "string" || !/^[\w.+-]+\/[\w.+-]+$/.test(r.mediatype))) {
      problems.push({ at: `${at}.mediatype`, message: "mediatype must look like type/subtype" });
    }
    if (r.bytes !== undefined && !(Number.isInteger(r.bytes) && (r.bytes as number) >= 0)) problems.push({ at: `${at}.bytes`, message: "bytes must be a whole number ≥ 0" });
    if (r.hash !== undefined && (typeof r.hash !== "string" || !/^([a-z0-9]+:)?[0-9a-f]+$/.test(r.hash))) problems.push({ at: `${at}.hash`, message: "hash must be hex, optionally prefixed with the algorithm" });
    if (tabular && r.profile !== undefined && r.profile !== "tabular-data-resource") {
      problems.push({ at: `${at}.profile`, message: "a tabular data package holds only tabular-data-resource resources" });
    }
    if (r.schema === undefined) {
      if (tabular) problems.push({ at: `${at}.schema`, message: "a tabular data resource needs a schema" });
    } else {
      const names = checkSchema(r.schema, `${at}.schema`, problems);
      if (typeof r.name === "string") fieldsOf.set(r.name, names);
    }
  });
  descriptor.resources.forEach((r, i) => { if (isObj(r)) checkForeignKeys(r, `resources[${i}]`, fieldsOf, problems); });
  return problems;
}
