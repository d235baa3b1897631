// GHS hazard statements used by the salt and desiccant references. The texts are the standard
// GHS (UN "Purple Book") hazard statement wordings, so a reader can check them against any SDS.

export type GhsCode =
  | "H272"
  | "H290"
  | "H302"
  | "H314"
  | "H315"
  | "H317"
  | "H319"
  | "H334"
  | "H335"
  | "H341"
  | "H350i"
  | "H360F"
  | "H410";

export interface GhsStatement {
  code: GhsCode;
  text: string;
}

export const GHS_STATEMENTS: Readonly<Record<GhsCode, string>> = {
  H272: "May intensify fire; oxidiser",
  H290: "May be corrosive to metals",
  H302: "Harmful if swallowed",
  H314: "Causes severe skin burns and eye damage",
  H315: "Causes skin irritation",
  H317: "May cause an allergic skin reaction",
  H319: "Causes serious eye irritation",
  H334: "May cause allergy or asthma symptoms or breathing difficulties if inhaled",
  H335: "May cause respiratory irritation",
  H341: "Suspected of causing genetic defects",
  H350i: "May cause cancer by inhalation",
  H360F: "May damage fertility",
  H410: "Very toxic to aquatic life with long lasting effects",
};

export function ghsStatements(codes: readonly GhsCode[]): GhsStatement[] {
  return codes.map((code) => ({ code, text: GHS_STATEMENTS[code] }));
}
