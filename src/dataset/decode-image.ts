import { decode as decodeJpegBytes } from 'jpeg-js';
import { decodeDicom, isDicomPart10 } from './dicom';
import { DatasetError } from './errors';
import { decodePng } from './png-codec';
import type { DecodedImage } from './types';

/** tEXt keyword that marks a PNG as synthetic (value 'true'); the phantom generator writes it. */
export const PNG_SYNTHETIC_KEYWORD = 'Synthetic';

/** Rec. 601 luma weights (ITU-R BT.601): Y = 0.299 R + 0.587 G + 0.114 B. */
const LUMA_601 = [0.299, 0.587, 0.114] as const;

const READ_FIX = 'check that the file is a complete PNG, JPEG or DICOM image (copy or export it again)';

export type ImageFormat = DecodedImage['format'];

/** The format named by the file's first bytes (PNG signature, JPEG SOI marker, DICOM 'DICM'), or undefined. */
export function sniffImageFormat(bytes: Uint8Array): ImageFormat | undefined {
  if (bytes.length >= 8 && bytes[0] === 0x89 && bytes[1] === 0x50 && bytes[2] === 0x4e && bytes[3] === 0x47) return 'png';
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'jpeg';
  if (isDicomPart10(bytes)) return 'dicom';
  return undefined;
}

function luminance(samples: ArrayLike<number>, n: number, channels: number): Float32Array {
  const out = new Float32Array(n);
  if (channels <= 2) {
    for (let i = 0; i < n; i++) out[i] = samples[i * channels];
  } else {
    for (let i = 0; i < n; i++) {
      const p = i * channels;
      out[i] = LUMA_601[0] * samples[p] + LUMA_601[1] * samples[p + 1] + LUMA_601[2] * samples[p + 2];
    }
  }
  return out;
}

function decodePngImage(bytes: Uint8Array, fileName: string): DecodedImage {
  const png = decodePng(bytes, fileName);
  const n = png.width * png.height;
  // Alpha is dropped rather than composited: radiographs carry no meaningful transparency.
  const data = luminance(png.data, n, png.channels);
  const max = png.bitDepth === 16 ? 65535 : 255;
  const flag = png.text[PNG_SYNTHETIC_KEYWORD];
  return {
    width: png.width,
    height: png.height,
    data,
    format: 'png',
    bitDepth: png.bitDepth,
    valueRange: [0, max],
    synthetic: flag === 'true',
  };
}

function decodeJpegImage(bytes: Uint8Array, fileName: string): DecodedImage {
  let decoded: { width: number; height: number; data: Uint8Array };
  try {
    // tolerantDecoding off: a truncated file must fail, not decode into a partly grey image.
    decoded = decodeJpegBytes(bytes, { useTArray: true, formatAsRGBA: true, tolerantDecoding: false, maxMemoryUsageInMB: 1024 });
  } catch (cause) {
    const detail = cause instanceof Error ? cause.message : String(cause);
    throw new DatasetError(`cannot read the JPEG: ${detail}`, { code: 'unreadable-image', file: fileName, fix: READ_FIX, cause });
  }
  if (!decoded.width || !decoded.height || decoded.data.length < decoded.width * decoded.height * 4) {
    throw new DatasetError('cannot read the JPEG: no image data', { code: 'unreadable-image', file: fileName, fix: READ_FIX });
  }
  return {
    width: decoded.width,
    height: decoded.height,
    data: luminance(decoded.data, decoded.width * decoded.height, 4),
    format: 'jpeg',
    bitDepth: 8,
    valueRange: [0, 255],
  };
}

/**
 * Decodes an image file into single-channel float values, choosing the decoder by magic bytes
 * (never by the file name's extension). PNG and JPEG colour becomes Rec. 601 luma
 * (ITU-R BT.601: 0.299 R + 0.587 G + 0.114 B); alpha is dropped. DICOM goes through decodeDicom.
 * Throws DatasetError('unreadable-image') naming `fileName` for empty, truncated or unknown files,
 * and the codes of decodeDicom / decodePng for unsupported content.
 */
export function decodeImage(bytes: Uint8Array, fileName: string): DecodedImage {
  if (bytes.length === 0) throw new DatasetError('the file is empty', { code: 'unreadable-image', file: fileName, fix: READ_FIX });
  const format = sniffImageFormat(bytes);
  if (format === 'png') return decodePngImage(bytes, fileName);
  if (format === 'jpeg') return decodeJpegImage(bytes, fileName);
  if (format === 'dicom') return decodeDicom(bytes, fileName);
  throw new DatasetError('the file is not a PNG, JPEG or DICOM Part 10 image (its first bytes match none of them)', {
    code: 'unreadable-image',
    file: fileName,
    fix: READ_FIX,
  });
}

function pngHeaderSize(bytes: Uint8Array): { width: number; height: number } | undefined {
  // IHDR is the first chunk: signature (8), length (4), 'IHDR' (4), width (4), height (4).
  if (bytes.length < 24 || bytes[12] !== 0x49 || bytes[13] !== 0x48 || bytes[14] !== 0x44 || bytes[15] !== 0x52) return undefined;
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return { width: v.getUint32(16), height: v.getUint32(20) };
}

function jpegHeaderSize(bytes: Uint8Array): { width: number; height: number } | undefined {
  let p = 2;
  while (p + 9 < bytes.length) {
    if (bytes[p] !== 0xff) return undefined;
    const marker = bytes[p + 1];
    const length = (bytes[p + 2] << 8) | bytes[p + 3];
    // Start-of-frame markers SOF0..SOF15, except DHT (C4), JPG (C8) and DAC (CC), carry the size.
    if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
      return { height: (bytes[p + 5] << 8) | bytes[p + 6], width: (bytes[p + 7] << 8) | bytes[p + 8] };
    }
    p += 2 + length;
  }
  return undefined;
}

/**
 * The image's size in pixels, read from the PNG or JPEG header without decoding the pixels
 * (DICOM files are decoded). Throws the same DatasetError as decodeImage for an unreadable file.
 */
export function readImageSize(bytes: Uint8Array, fileName: string): { width: number; height: number } {
  const format = sniffImageFormat(bytes);
  const quick = format === 'png' ? pngHeaderSize(bytes) : format === 'jpeg' ? jpegHeaderSize(bytes) : undefined;
  if (quick && quick.width > 0 && quick.height > 0) return quick;
  const image = decodeImage(bytes, fileName);
  return { width: image.width, height: image.height };
}
