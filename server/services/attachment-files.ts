import { fileTypeFromBuffer } from 'file-type';
import { DOCUMENT_TYPES, PHOTO_TYPES, WRONG_TYPE_MESSAGE, type AttachmentMime } from '../../shared/schemas/attachments';
import { badRequest } from '../http-error';

export const THUMB_WIDTH = 320;
export const THUMB_MIME = 'image/webp';
// Well above any phone camera (about 50 MP) and well below what would exhaust memory while decoding.
const MAX_INPUT_PIXELS = 120_000_000;

export interface InspectedFile {
  mime: AttachmentMime;
  kind: 'photo' | 'document';
  width: number | null;
  height: number | null;
  thumb: Buffer | null;
}

const wrongType = () => badRequest(WRONG_TYPE_MESSAGE, [{ path: 'file', message: WRONG_TYPE_MESSAGE }]);
const isPhoto = (m: string): m is (typeof PHOTO_TYPES)[number] => (PHOTO_TYPES as readonly string[]).includes(m);
const isDocument = (m: string): m is (typeof DOCUMENT_TYPES)[number] => (DOCUMENT_TYPES as readonly string[]).includes(m);

/**
 * What the bytes really are, from their content alone (the name and the browser's Content-Type
 * are the sender's claim). Photos must also decode; each gets a small WebP preview, turned
 * upright as the camera recorded it and without the original's metadata.
 */
export async function inspectFile(bytes: Buffer): Promise<InspectedFile> {
  const type = await fileTypeFromBuffer(bytes);
  if (!type) throw wrongType();
  if (isDocument(type.mime)) return { mime: type.mime, kind: 'document', width: null, height: null, thumb: null };
  if (!isPhoto(type.mime)) throw wrongType();
  // Loaded with the first photo: the image libraries take tens of MB a server without photos need not hold.
  const { default: sharp } = await import('sharp');
  try {
    const image = sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' });
    const meta = await image.metadata();
    const thumb = await image.clone().rotate().resize({ width: THUMB_WIDTH, withoutEnlargement: true }).webp({ quality: 72 }).toBuffer();
    return { mime: type.mime, kind: 'photo', width: meta.autoOrient.width, height: meta.autoOrient.height, thumb };
  } catch {
    // The image libraries shipped with sharp cannot decode HEVC-coded HEIC: keep such a photo without a preview.
    if (type.mime === 'image/heic' || type.mime === 'image/heif') return { mime: type.mime, kind: 'photo', width: null, height: null, thumb: null };
    throw badRequest('That photo could not be read; it may be damaged. Take it again or choose another.', [
      { path: 'file', message: 'The image data is damaged or incomplete.' },
    ]);
  }
}
