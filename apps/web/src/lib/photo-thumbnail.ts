// The thumbnail of a note's photo, made in the browser before upload (docs/decisions/dof-photo-thumbnails.md):
// the photo decoded by createImageBitmap, drawn on a canvas at most DOF_THUMB_MAX_PX on its longer
// side, encoded as JPEG. Lists on Tap and Review and the hand-over report show it instead of the
// full photo, so they load tens of kB instead of megabytes.
import { DOF_THUMB_MAX_BYTES, DOF_THUMB_MAX_PX } from '@resonote/contracts';

/** The thumbnail's size in px for a photo of `width` × `height`: scaled down to fit `max` on the longer side, never up. */
export function thumbnailSize(width: number, height: number, max = DOF_THUMB_MAX_PX): { width: number; height: number } {
  if (!(width > 0 && height > 0)) throw new RangeError(`photo size ${width} × ${height} must be positive`);
  const scale = Math.min(1, max / Math.max(width, height));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/**
 * A JPEG thumbnail of the photo, or null when the browser cannot decode it (the photo is then sent
 * without one; the server still checks the photo itself) or the result would exceed the limit.
 */
export async function makeThumbnail(photo: Blob): Promise<Blob | null> {
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(photo);
  } catch {
    return null;
  }
  try {
    const size = thumbnailSize(bitmap.width, bitmap.height);
    const canvas = document.createElement('canvas');
    canvas.width = size.width;
    canvas.height = size.height;
    const ctx = canvas.getContext('2d');
    if (!ctx) return null;
    // JPEG has no transparency: a white ground under a PNG's transparent parts.
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, size.width, size.height);
    ctx.drawImage(bitmap, 0, 0, size.width, size.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/jpeg', 0.8));
    return blob && blob.size <= DOF_THUMB_MAX_BYTES ? blob : null;
  } finally {
    bitmap.close();
  }
}
