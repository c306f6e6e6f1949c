// The icon browsers ask for at /favicon.ico: the same picture as public/favicon.svg (a blue
// rounded square with a white "T"), drawn here as a 16×16 32-bit bitmap inside an ICO file so
// that no binary file needs to be kept in the repository. ICO layout: 6-byte header, one
// 16-byte directory entry, then a BITMAPINFOHEADER (height doubled for the AND mask), BGRA rows
// bottom-up, and a 1-bit AND mask (all zero: the alpha channel decides). Microsoft, "Icons"
// (Win32 documentation, ICONDIR / ICONDIRENTRY structures).

const SIZE = 16;
const BLUE = [0xb2, 0x72, 0x00, 0xff]; // #0072b2 as B, G, R, A
const WHITE = [0xff, 0xff, 0xff, 0xff];

/** The colour of pixel (x, y), y counted from the top; null = transparent. */
function pixel(x: number, y: number): number[] | null {
  // Rounded square from 1 to 14 with corner radius 3 (as the SVG's rect).
  const cx = Math.min(Math.max(x + 0.5, 4), 12);
  const cy = Math.min(Math.max(y + 0.5, 4), 12);
  if (x < 1 || x > 14 || y < 1 || y > 14 || (x + 0.5 - cx) ** 2 + (y + 0.5 - cy) ** 2 > 9) return null;
  const bar = y >= 4 && y < 6 && x >= 4 && x < 12;
  const stem = y >= 6 && y < 12 && x >= 7 && x < 9;
  return bar || stem ? WHITE : BLUE;
}

export function faviconIco(): Uint8Array {
  const pixels = SIZE * SIZE * 4;
  const mask = SIZE * 4; // 16 bits per row padded to 32
  const image = 40 + pixels + mask;
  const out = new Uint8Array(6 + 16 + image);
  const v = new DataView(out.buffer);
  v.setUint16(2, 1, true); // type: icon
  v.setUint16(4, 1, true); // one image
  out[6] = SIZE;
  out[7] = SIZE;
  v.setUint16(10, 1, true); // colour planes
  v.setUint16(12, 32, true); // bits per pixel
  v.setUint32(14, image, true);
  v.setUint32(18, 22, true); // offset of the image
  const h = 22;
  v.setUint32(h, 40, true);
  v.setInt32(h + 4, SIZE, true);
  v.setInt32(h + 8, SIZE * 2, true);
  v.setUint16(h + 12, 1, true);
  v.setUint16(h + 14, 32, true);
  v.setUint32(h + 20, pixels + mask, true);
  for (let row = 0; row < SIZE; row++) {
    const y = SIZE - 1 - row; // bitmaps are stored bottom-up
    for (let x = 0; x < SIZE; x++) {
      const c = pixel(x, y);
      if (c) out.set(c, h + 40 + (row * SIZE + x) * 4);
    }
  }
  return out;
}
