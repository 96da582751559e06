// Small real images for note-photo tests: a PNG written by hand (signature, IHDR, one zlib IDAT,
// IEND; ISO/IEC 15948), and the first bytes of JPEG and WebP files.
import { deflateSync } from 'node:zlib';

const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const b of buf) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}

/** An RGB PNG of `width` × `height` pixels: a steel-grey plate with a dark square (a "sensor") in the middle. */
export function platePng(width = 160, height = 120): Buffer {
  const rows: Buffer[] = [];
  for (let y = 0; y < height; y++) {
    const row = Buffer.alloc(1 + width * 3);
    for (let x = 0; x < width; x++) {
      const sensor = Math.abs(x - width / 2) < width / 10 && Math.abs(y - height / 2) < height / 8;
      const grey = sensor ? 40 : 150 + Math.round((60 * x) / width);
      row[1 + x * 3] = grey;
      row[2 + x * 3] = grey;
      row[3 + x * 3] = sensor ? 40 : grey + 10;
    }
    rows.push(row);
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // truecolour
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(Buffer.concat(rows))), chunk('IEND', Buffer.alloc(0))]);
}

/** The first bytes of a JFIF JPEG (SOI, APP0 "JFIF") followed by padding: enough for a type check. */
export const jpegHead = () => Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00]), Buffer.alloc(64)]);
/** A RIFF/WEBP header (RIFF, size, WEBP, VP8L): enough for a type check. */
export const webpHead = () => Buffer.concat([Buffer.from('RIFF', 'ascii'), Buffer.from([0x24, 0, 0, 0]), Buffer.from('WEBPVP8L', 'ascii'), Buffer.alloc(32)]);
