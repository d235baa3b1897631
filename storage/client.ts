// S3 clients built from the environment, so the same code talks to the local fake or to real S3.
// No "server-only" marker: scripts (tsx) and tests import this too.
import { S3Client } from "@aws-sdk/client-s3";

export interface StorageConfig {
  /** Where the server reaches storage. */
  endpoint: string;
  /** Where the browser reaches storage; presigned URLs are signed for this host. */
  publicEndpoint: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  bucket: string;
  forcePathStyle: boolean;
}

export function readStorageConfig(env: NodeJS.ProcessEnv = process.env): StorageConfig {
  const endpoint = env.S3_ENDPOINT || "http://127.0.0.1:9390";
  return {
    endpoint,
    publicEndpoint: env.S3_PUBLIC_ENDPOINT || endpoint,
    region: env.S3_REGION || "us-east-1",
    accessKeyId: env.S3_ACCESS_KEY_ID || "rustline-local",
    secretAccessKey: env.S3_SECRET_ACCESS_KEY || "rustline-local-secret-key",
    bucket: env.S3_BUCKET || "rustline",
    forcePathStyle: !/^(0|false|no)$/i.test(env.S3_FORCE_PATH_STYLE ?? "true"),
  };
}

/** Thrown when object storage cannot be reached at all (as opposed to an S3 error answer). */
export class StorageUnavailableError extends Error {
  constructor(cause: unknown) {
    super("Object storage is not reachable", { cause });
    this.name = "StorageUnavailableError";
  }
}

export function createS3Client(config: StorageConfig, endpoint: string = config.endpoint): S3Client {
  // The SDK prints a multi-line notice about future Node versions in every process that builds a client;
  // it reads exactly this variable ("true") when the client is built. Set it to anything else to see it.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";
  const client = new S3Client({
    endpoint,
    region: config.region,
    forcePathStyle: config.forcePathStyle,
    credentials: { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey },
    // Newer SDKs add CRC32 checksums and aws-chunked bodies by default; plain bodies keep
    // presigned URLs simple and work with every S3-compatible store.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  // A failure with no HTTP answer (connection refused, reset, DNS) means storage is down; mark it so
  // callers can tell the user plainly instead of reporting a generic error.
  client.middlewareStack.add(
    (next) => async (args) => {
      try {
        return await next(args);
      } catch (err) {
        const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
        const code = (err as { code?: string }).code ?? "";
        if (!status && /ECONNREFUSED|ECONNRESET|ENOTFOUND|ETIMEDOUT|EPIPE|EAI_AGAIN/.test(code + String((err as Error).message))) {
          throw new StorageUnavailableError(err);
        }
        throw err;
      }
    },
    { step: "finalizeRequest", name: "rustlineStorageUnavailable", priority: "low" },
  );
  return client;
}

export interface Storage {
  config: StorageConfig;
  /** For server-side reads and writes. */
  client: S3Client;
  /** For presigning only: signs URLs with the public endpoint's host. */
  presignClient: S3Client;
}

let cached: { key: string; storage: Storage } | null = null;

/** The storage clients for the current environment (rebuilt if the S3_* variables change). */
export function getStorage(): Storage {
  const config = readStorageConfig();
  const key = JSON.stringify(config);
  if (cached?.key !== key) {
    cached?.storage.client.destroy();
    cached?.storage.presignClient.destroy();
    const client = createS3Client(config);
    const presignClient = config.publicEndpoint === config.endpoint ? client : createS3Client(config, config.publicEndpoint);
    cached = { key, storage: { config, client, presignClient } };
  }
  return cached.storage;
}
