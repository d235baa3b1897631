// Which files may be uploaded as photos: the accepted types and the size limit, with the message a
// user reads when a file is refused.
import { AppError } from "@/lib/auth/errors";
import { formatBytes, isPhotoContentType, PHOTO_CONTENT_TYPES, PHOTO_TYPES, type PhotoContentType } from "./config";

/** The photo type of an upload request, or an "invalid" / "too-large" error naming the field. */
export function acceptedPhotoType(input: { contentType: string; sizeBytes: number }, maxBytes: number): PhotoContentType {
  const contentType = input.contentType.toLowerCase();
  if (!isPhotoContentType(contentType)) {
    const accepted = PHOTO_CONTENT_TYPES.map((t) => PHOTO_TYPES[t].label).join(", ");
    throw new AppError("invalid", `Only ${accepted} photos can be uploaded.`, { contentType: [`"${input.contentType}" is not accepted; use ${accepted}.`] });
  }
  if (input.sizeBytes > maxBytes) {
    throw new AppError("too-large", `The file is ${formatBytes(input.sizeBytes)}; the limit is ${formatBytes(maxBytes)}.`, { sizeBytes: [`Larger than ${formatBytes(maxBytes)}.`] });
  }
  return contentType;
}
