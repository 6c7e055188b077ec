import { fileTypeFromBuffer } from 'file-type';
import { DOCUMENT_TYPES, PHOTO_TYPES, WRONG_TYPE_MESSAGE, type AttachmentMime } from '../../shared/schemas/attachments';
import { HttpError, badRequest } from '../http-error';

export const THUMB_WIDTH = 320;
export const THUMB_MIME = 'image/webp';
// Well above any phone camera (about 50 MP) and well below what would exhaust memory while decoding.
const MAX_INPUT_PIXELS = 120_000_000;
// High enough that writing on a tyre wall or a gauge's scale stays as legible as in the camera's own file.
const ORIGINAL_QUALITY = 92;

export interface InspectedFile {
  mime: AttachmentMime;
  kind: 'photo' | 'document';
  /** What to store: a document as sent; a photo re-encoded upright without its metadata. */
  bytes: Buffer;
  width: number | null;
  height: number | null;
  thumb: Buffer | null;
}

const wrongType = () => badRequest(WRONG_TYPE_MESSAGE, [{ path: 'file', message: WRONG_TYPE_MESSAGE }]);
const isPhoto = (m: string): m is (typeof PHOTO_TYPES)[number] => (PHOTO_TYPES as readonly string[]).includes(m);
const isDocument = (m: string): m is (typeof DOCUMENT_TYPES)[number] => (DOCUMENT_TYPES as readonly string[]).includes(m);

/** A WebP whose image is stored in the lossless (VP8L) coding, found by walking its RIFF chunks. */
export function isLosslessWebp(bytes: Buffer): boolean {
  for (let at = 12; at + 8 <= bytes.length; ) {
    const fourcc = bytes.toString('latin1', at, at + 4);
    if (fourcc === 'VP8L') return true;
    if (fourcc === 'VP8 ' || fourcc === 'ANMF') return false;
    const size = bytes.readUInt32LE(at + 4);
    at += 8 + size + (size % 2);
  }
  return false;
}

/**
 * What the bytes really are, from their content alone (the name and the browser's Content-Type
 * are the sender's claim). Photos must also decode. A photo is stored re-encoded in its own
 * format, turned upright as the camera recorded it, without EXIF, XMP or IPTC (a phone's
 * photo carries where it was taken); only the colour profile is kept, so it looks the same.
 * Each photo also gets a small WebP preview.
 */
export async function inspectFile(bytes: Buffer): Promise<InspectedFile> {
  const type = await fileTypeFromBuffer(bytes);
  if (!type) throw wrongType();
  if (isDocument(type.mime)) return { mime: type.mime, kind: 'document', bytes, width: null, height: null, thumb: null };
  if (!isPhoto(type.mime)) throw wrongType();
  // Loaded with the first photo: the image libraries take tens of MB a server without photos need not hold.
  const { default: sharp } = await import('sharp');
  const heif = type.mime === 'image/heic' || type.mime === 'image/heif';
  try {
    const image = sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' });
    const meta = await image.metadata();
    if ((meta.pages ?? 1) > 1) {
      const message = 'Moving images are not kept. Upload a still photo (JPEG, PNG, WebP).';
      throw badRequest(message, [{ path: 'file', message }]);
    }
    // rotate() with no angle applies the EXIF orientation, and the output then has no orientation tag.
    const upright = image.clone().rotate().keepIccProfile();
    const encoded =
      type.mime === 'image/png'
        ? upright.png()
        : type.mime === 'image/webp'
          ? upright.webp(isLosslessWebp(bytes) ? { lossless: true } : { quality: ORIGINAL_QUALITY })
          : upright.jpeg({ quality: ORIGINAL_QUALITY });
    const { data, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumb = await image.clone().rotate().resize({ width: THUMB_WIDTH, withoutEnlargement: true }).webp({ quality: 72 }).toBuffer();
    // A HEIF that does decode is kept as JPEG, which every browser shows.
    const mime = heif ? 'image/jpeg' : type.mime;
    return { mime, kind: 'photo', bytes: data, width: info.width, height: info.height, thumb };
  } catch (e) {
    if (e instanceof HttpError) throw e;
    // The image libraries shipped with sharp cannot decode HEVC-coded HEIC, so its location could not be removed.
    if (heif)
      throw badRequest('HEIC photos cannot be stored here, as their location data could not be removed. Set the camera to JPEG (“Most compatible”) or share the photo as JPEG, then upload it again.', [
        { path: 'file', message: 'HEIC photos cannot be cleaned of their metadata on this server.' },
      ]);
    throw badRequest('That photo could not be read; it may be damaged. Take it again or choose another.', [
      { path: 'file', message: 'The image data is damaged or incomplete.' },
    ]);
  }
}
