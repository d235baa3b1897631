// SHA-256 of a file in the browser before it is uploaded: the upload URL is signed for these bytes.
// @noble/hashes hashes in slices (memory stays flat for large photos) and, unlike WebCrypto's
// subtle.digest, also works on pages served over plain HTTP on a lab network.
import { sha256 } from "@noble/hashes/sha2";
import { bytesToHex } from "@noble/hashes/utils";

const SLICE_BYTES = 4 * 1024 * 1024;

/** Lower-case hex SHA-256 of the blob's bytes. */
export async function sha256OfBlob(blob: Blob, sliceBytes = SLICE_BYTES): Promise<string> {
  const hash = sha256.create();
  for (let start = 0; start < blob.size; start += sliceBytes) {
    hash.update(new Uint8Array(await blob.slice(start, start + sliceBytes).arrayBuffer()));
  }
  return bytesToHex(hash.digest());
}
