// S3-style XML error bodies, so the AWS SDK and browsers see the same shapes real S3 sends.
import { randomBytes } from "node:crypto";

function escapeXml(text) {
  return String(text).replace(/[<>&'"]/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", "'": "&apos;", '"': "&quot;" })[c]);
}

export class S3Rejection extends Error {
  /** @param {number} status @param {string} code @param {string} message */
  constructor(status, code, message) {
    super(message);
    this.status = status;
    this.code = code;
  }
}

/**
 * Write an S3 error response. `headers` carries CORS headers so a browser can read why it failed.
 * @param {import("node:http").ServerResponse} res
 * @param {{ status: number, code: string, message: string, resource?: string, headers?: Record<string, string> }} err
 */
export function sendS3Error(res, { status, code, message, resource = "", headers = {} }) {
  if (res.headersSent) {
    res.destroy();
    return;
  }
  const requestId = randomBytes(8).toString("hex").toUpperCase();
  const body =
    '<?xml version="1.0" encoding="UTF-8"?>\n' +
    `<Error><Code>${escapeXml(code)}</Code><Message>${escapeXml(message)}</Message>` +
    `<Resource>${escapeXml(resource)}</Resource><RequestId>${requestId}</RequestId></Error>`;
  res.writeHead(status, {
    ...headers,
    "Content-Type": "application/xml",
    "Content-Length": Buffer.byteLength(body),
    "x-amz-request-id": requestId,
  });
  res.end(body);
}
