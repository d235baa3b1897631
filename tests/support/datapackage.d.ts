// The parts of the Frictionless reference library for JavaScript (npm `datapackage`) the tests use.
declare module "datapackage" {
  export class Resource {
    readonly name: string;
    read(options?: { cast?: boolean; relations?: boolean; keyed?: boolean }): Promise<unknown[]>;
  }
  export class Package {
    static load(descriptor: string | object, options?: { basePath?: string; strict?: boolean }): Promise<Package>;
    readonly valid: boolean;
    readonly errors: Error[];
    readonly resources: Resource[];
    readonly descriptor: Record<string, unknown>;
  }
}
