/** A small FITS image written by hand for tests (FITS standard 4.0: 2880-byte blocks, 80-character cards, big-endian). */
export function fitsImageBytes(cards: Record<string, string | number | boolean>, width: number, height: number, pixel: (x: number, y: number) => number): Uint8Array {
  const card = (k: string, v: string | number | boolean) => {
    const val = typeof v === 'string' ? `'${v.padEnd(8)}'` : typeof v === 'boolean' ? (v ? 'T' : 'F') : String(v);
    return `${k.padEnd(8)}= ${val.padStart(20)}`.padEnd(80);
  };
  const all = { SIMPLE: true, BITPIX: -32, NAXIS: 2, NAXIS1: width, NAXIS2: height, ...cards };
  let header = Object.entries(all).map(([k, v]) => card(k, v)).join('') + 'END'.padEnd(80);
  header = header.padEnd(Math.ceil(header.length / 2880) * 2880);
  const dataBytes = width * height * 4;
  const out = new Uint8Array(header.length + Math.ceil(dataBytes / 2880) * 2880);
  for (let i = 0; i < header.length; i++) out[i] = header.charCodeAt(i);
  const view = new DataView(out.buffer, header.length);
  // FITS pixel (x, y), 1-based, is stored at ((y - 1) * width + (x - 1)).
  for (let y = 1; y <= height; y++) for (let x = 1; x <= width; x++) view.setFloat32(((y - 1) * width + (x - 1)) * 4, pixel(x, y), false);
  return out;
}
