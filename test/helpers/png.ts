import { inflateSync } from 'node:zlib';

/** A decoded image: width, height and 8-bit RGBA pixels, row by row. */
export interface Image {
  readonly width: number;
  readonly height: number;
  readonly rgba: Uint8Array;
}

/**
 * Decode a PNG as Chromium writes screenshots (8-bit RGB or RGBA, not interlaced).
 * Source: W3C, Portable Network Graphics (PNG) Specification, 2nd ed., §11.2.2 (IHDR), §9 (filtering: None, Sub,
 * Up, Average, Paeth), §10 (zlib compression of the concatenated IDAT data).
 */
export function decodePng(png: Uint8Array): Image {
  const view = Buffer.from(png.buffer, png.byteOffset, png.byteLength);
  let offset = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const data: Buffer[] = [];
  while (offset < view.length) {
    const length = view.readUInt32BE(offset);
    const type = view.toString('latin1', offset + 4, offset + 8);
    const chunk = view.subarray(offset + 8, offset + 8 + length);
    if (type === 'IHDR') {
      width = chunk.readUInt32BE(0);
      height = chunk.readUInt32BE(4);
      const [depth, colour, interlace] = [chunk[8], chunk[9], chunk[12]];
      if (depth !== 8 || (colour !== 2 && colour !== 6) || interlace !== 0)
        throw new Error(`PNG not supported here: bit depth ${depth}, colour type ${colour}, interlace ${interlace}`);
      channels = colour === 6 ? 4 : 3;
    } else if (type === 'IDAT') data.push(chunk);
    else if (type === 'IEND') break;
    offset += 12 + length;
  }
  const raw = inflateSync(Buffer.concat(data));
  const stride = width * channels;
  const pixels = new Uint8Array(stride * height);
  // Each row undone by its filter type in a loop of its own (a switch per byte costs seconds on a full-page screenshot).
  for (let row = 0; row < height; row++) {
    const filter = raw[row * (stride + 1)];
    const from = row * (stride + 1) + 1;
    const at = row * stride;
    const above = at - stride;
    const first = row === 0;
    switch (filter) {
      case 0:
        pixels.set(raw.subarray(from, from + stride), at);
        break;
      case 1:
        for (let i = 0; i < stride; i++) pixels[at + i] = (raw[from + i] + (i >= channels ? pixels[at + i - channels] : 0)) & 0xff;
        break;
      case 2:
        for (let i = 0; i < stride; i++) pixels[at + i] = (raw[from + i] + (first ? 0 : pixels[above + i])) & 0xff;
        break;
      case 3:
        for (let i = 0; i < stride; i++) {
          const left = i >= channels ? pixels[at + i - channels] : 0;
          const up = first ? 0 : pixels[above + i];
          pixels[at + i] = (raw[from + i] + ((left + up) >> 1)) & 0xff;
        }
        break;
      case 4:
        for (let i = 0; i < stride; i++) {
          const left = i >= channels ? pixels[at + i - channels] : 0;
          const up = first ? 0 : pixels[above + i];
          const upLeft = !first && i >= channels ? pixels[above + i - channels] : 0;
          const p = left + up - upLeft;
          const pa = p > left ? p - left : left - p;
          const pb = p > up ? p - up : up - p;
          const pc = p > upLeft ? p - upLeft : upLeft - p;
          pixels[at + i] = (raw[from + i] + (pa <= pb && pa <= pc ? left : pb <= pc ? up : upLeft)) & 0xff;
        }
        break;
      default:
        throw new Error(`PNG row ${row}: filter type ${filter}, expected 0 to 4`);
    }
  }
  if (channels === 4) return { width, height, rgba: pixels };
  const rgba = new Uint8Array(width * height * 4);
  for (let k = 0, j = 0; k < rgba.length; k += 4, j += 3) {
    rgba[k] = pixels[j];
    rgba[k + 1] = pixels[j + 1];
    rgba[k + 2] = pixels[j + 2];
    rgba[k + 3] = 255;
  }
  return { width, height, rgba };
}

/** Variance of the grey level (mean of R, G, B, 0–255) over a rectangle of the image. */
export function greyVariance(image: Image, box: { x: number; y: number; width: number; height: number }): number {
  let sum = 0;
  let squares = 0;
  let count = 0;
  for (let row = Math.max(0, Math.floor(box.y)); row < Math.min(image.height, Math.ceil(box.y + box.height)); row++) {
    for (let column = Math.max(0, Math.floor(box.x)); column < Math.min(image.width, Math.ceil(box.x + box.width)); column++) {
      const k = (row * image.width + column) * 4;
      const grey = (image.rgba[k] + image.rgba[k + 1] + image.rgba[k + 2]) / 3;
      sum += grey;
      squares += grey * grey;
      count++;
    }
  }
  return count === 0 ? 0 : squares / count - (sum / count) ** 2;
}

/** Pixels of a rectangle where image `a` is darker than `b` (grey level lower by more than `tolerance`): the ink that `a` adds. */
export function inkedPixels(a: Image, b: Image, box: { x: number; y: number; width: number; height: number }, tolerance = 24): number {
  let count = 0;
  for (let row = Math.max(0, Math.floor(box.y)); row < Math.min(a.height, b.height, Math.ceil(box.y + box.height)); row++) {
    for (let column = Math.max(0, Math.floor(box.x)); column < Math.min(a.width, b.width, Math.ceil(box.x + box.width)); column++) {
      const k = (row * a.width + column) * 4;
      const greyA = (a.rgba[k] + a.rgba[k + 1] + a.rgba[k + 2]) / 3;
      const greyB = (b.rgba[k] + b.rgba[k + 1] + b.rgba[k + 2]) / 3;
      if (greyB - greyA > tolerance) count++;
    }
  }
  return count;
}
