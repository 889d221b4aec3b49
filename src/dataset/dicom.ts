import * as dicomParserModule from 'dicom-parser';
import { inflateSync } from 'fflate';
import { DatasetError } from './errors';
import { SYNTHETIC_MARKER } from './dicom-writer';
import type { DecodedImage } from './types';

type DicomParserApi = typeof dicomParserModule;
// dicom-parser ships a UMD bundle: Node's ESM loader exposes it only as a default export,
// bundlers as named exports.
const dicomParser: DicomParserApi = (dicomParserModule as unknown as { default?: DicomParserApi }).default ?? dicomParserModule;

/** Transfer syntaxes whose pixel data is stored uncompressed, which this reader decodes (PS3.5 A.1-A.5). */
export const UNCOMPRESSED_TRANSFER_SYNTAXES: Readonly<Record<string, string>> = {
  '1.2.840.10008.1.2': 'Implicit VR Little Endian',
  '1.2.840.10008.1.2.1': 'Explicit VR Little Endian',
  '1.2.840.10008.1.2.1.99': 'Deflated Explicit VR Little Endian',
  '1.2.840.10008.1.2.2': 'Explicit VR Big Endian',
};

/** Names of the compressed transfer syntaxes (PS3.6 Annex A), used in error messages. */
export const COMPRESSED_TRANSFER_SYNTAXES: Readonly<Record<string, string>> = {
  '1.2.840.10008.1.2.4.50': 'JPEG Baseline (Process 1)',
  '1.2.840.10008.1.2.4.51': 'JPEG Extended (Process 2 & 4)',
  '1.2.840.10008.1.2.4.57': 'JPEG Lossless, Non-Hierarchical (Process 14)',
  '1.2.840.10008.1.2.4.70': 'JPEG Lossless, Non-Hierarchical, First-Order Prediction',
  '1.2.840.10008.1.2.4.80': 'JPEG-LS Lossless',
  '1.2.840.10008.1.2.4.81': 'JPEG-LS Lossy (Near-Lossless)',
  '1.2.840.10008.1.2.4.90': 'JPEG 2000 (Lossless Only)',
  '1.2.840.10008.1.2.4.91': 'JPEG 2000',
  '1.2.840.10008.1.2.4.92': 'JPEG 2000 Part 2 Multi-component (Lossless Only)',
  '1.2.840.10008.1.2.4.93': 'JPEG 2000 Part 2 Multi-component',
  '1.2.840.10008.1.2.4.201': 'High-Throughput JPEG 2000 (Lossless Only)',
  '1.2.840.10008.1.2.4.202': 'High-Throughput JPEG 2000 with RPCL Options (Lossless Only)',
  '1.2.840.10008.1.2.4.203': 'High-Throughput JPEG 2000',
  '1.2.840.10008.1.2.5': 'RLE Lossless',
};

const DEFLATED = '1.2.840.10008.1.2.1.99';

const CONVERT_FIX =
  'convert the file to Explicit VR Little Endian (uncompressed) with a DICOM toolkit, e.g. dcmdjpeg/dcmdrle or gdcmconv --raw, then load it again';

/** True when the bytes carry the Part 10 'DICM' prefix at offset 128 (PS3.10 7.1). */
export function isDicomPart10(bytes: Uint8Array): boolean {
  return bytes.length >= 132 && bytes[128] === 0x44 && bytes[129] === 0x49 && bytes[130] === 0x43 && bytes[131] === 0x4d;
}

const LONG_LENGTH_VRS = new Set(['OB', 'OD', 'OF', 'OL', 'OV', 'OW', 'SQ', 'SV', 'UC', 'UN', 'UR', 'UT', 'UV']);

/**
 * Reads the file meta group (always Explicit VR Little Endian, PS3.10 7.1) from offset 132.
 * Returns the Transfer Syntax UID and the offset where the data set starts. Read here rather than
 * by dicom-parser, which reads one element past the group and so fails on deflated data sets.
 */
function readMetaGroup(bytes: Uint8Array): { syntax: string; dataSetOffset: number } | undefined {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let p = 132;
  let syntax = '';
  while (p + 8 <= bytes.length && view.getUint16(p, true) === 0x0002) {
    const element = view.getUint16(p + 2, true);
    const vr = String.fromCharCode(bytes[p + 4], bytes[p + 5]);
    let length: number;
    let valueStart: number;
    if (LONG_LENGTH_VRS.has(vr)) {
      if (p + 12 > bytes.length) return undefined;
      length = view.getUint32(p + 8, true);
      valueStart = p + 12;
    } else {
      length = view.getUint16(p + 6, true);
      valueStart = p + 8;
    }
    if (length === 0xffffffff || valueStart + length > bytes.length) return undefined;
    if (element === 0x0010) {
      syntax = String.fromCharCode(...bytes.subarray(valueStart, valueStart + length)).replace(/[\0 ]+$/, '');
    }
    p = valueStart + length;
  }
  return { syntax, dataSetOffset: p };
}

/**
 * Decodes the first frame of a single-channel DICOM Part 10 image in an uncompressed transfer
 * syntax (Implicit VR LE, Explicit VR LE, Deflated Explicit VR LE, Explicit VR BE), Bits Allocated
 * 8 or 16, signed or unsigned. Applies, in the order of PS3.4 N.2: the stored-bit mask (Bits Stored,
 * High Bit), the modality LUT as Rescale Slope/Intercept (PS3.3 C.11.1.1.2), and for MONOCHROME1 an
 * inversion v -> lo + hi - v over the modality output range [lo, hi], so higher means brighter in
 * `data`. The VOI window (first value when multi-valued, PS3.3 C.11.2.1.2) is returned in the units
 * of `data`; for MONOCHROME1 its centre becomes lo + hi - c + 1, which makes
 * applyVoiLinear(inverted, c', w) equal 1 - applyVoiLinear(original, c, w) exactly.
 * `valueRange` is that modality output range [lo, hi] of all storable values.
 * Throws DatasetError: 'unsupported-transfer-syntax' for compressed pixel data (names the syntax,
 * its UID and the fix), 'unsupported-image' for colour or other layouts, 'unreadable-image' otherwise.
 */
export function decodeDicom(bytes: Uint8Array, fileName: string): DecodedImage {
  const unreadable = (what: string, cause?: unknown): never => {
    throw new DatasetError(`cannot read the DICOM file: ${what}`, {
      code: 'unreadable-image',
      file: fileName,
      fix: 'check that the file is a complete DICOM Part 10 file (copy it again or export it again from the source)',
      cause,
    });
  };
  const unsupported = (what: string): never => {
    throw new DatasetError(what, {
      code: 'unsupported-image',
      file: fileName,
      fix: 'export a single-channel greyscale (MONOCHROME1 or MONOCHROME2) image with 8 or 16 bits allocated',
    });
  };
  if (!isDicomPart10(bytes)) unreadable("the 'DICM' prefix at byte 128 is missing (not a DICOM Part 10 file)");

  const meta = readMetaGroup(bytes);
  if (meta === undefined) unreadable('the file meta information (group 0002) is damaged or truncated');
  const { syntax, dataSetOffset } = meta as { syntax: string; dataSetOffset: number };
  if (syntax === '') unreadable('the file meta information has no Transfer Syntax UID (0002,0010)');
  if (!(syntax in UNCOMPRESSED_TRANSFER_SYNTAXES)) {
    const name = COMPRESSED_TRANSFER_SYNTAXES[syntax] ?? 'an unknown transfer syntax';
    throw new DatasetError(`the pixel data is stored as ${name} (transfer syntax UID ${syntax}), which Tessera does not decode`, {
      code: 'unsupported-transfer-syntax',
      file: fileName,
      item: 'Transfer Syntax UID (0002,0010)',
      fix: CONVERT_FIX,
    });
  }

  let ds: dicomParserModule.DataSet;
  try {
    if (syntax === DEFLATED) {
      // The data set after the meta group is raw deflate (PS3.5 A.5); parse the inflated bytes on their own.
      const inflated = inflateSync(bytes.subarray(dataSetOffset));
      ds = dicomParser.parseDicom(inflated, { TransferSyntaxUID: '1.2.840.10008.1.2.1' });
    } else {
      ds = dicomParser.parseDicom(bytes);
    }
  } catch (cause) {
    const detail = typeof cause === 'string' ? cause : cause instanceof Error ? cause.message : String(cause);
    return unreadable(`the data set cannot be parsed (${detail})`, cause);
  }

  const rows = ds.uint16('x00280010');
  const cols = ds.uint16('x00280011');
  const samples = ds.uint16('x00280002') ?? 1;
  const photometric = (ds.string('x00280004') ?? '').trim();
  const bitsAllocated = ds.uint16('x00280100');
  const bitsStored = ds.uint16('x00280101') ?? bitsAllocated;
  const highBit = ds.uint16('x00280102') ?? (bitsStored === undefined ? undefined : bitsStored - 1);
  const signed = (ds.uint16('x00280103') ?? 0) === 1;
  if (rows === undefined || cols === undefined || rows === 0 || cols === 0) unreadable('Rows (0028,0010) or Columns (0028,0011) is missing or zero');
  if (bitsAllocated === undefined) unreadable('Bits Allocated (0028,0100) is missing');
  if (samples !== 1) unsupported(`the image has ${samples} samples per pixel (colour), which Tessera does not read`);
  if (photometric !== 'MONOCHROME1' && photometric !== 'MONOCHROME2') unsupported(`Photometric Interpretation is '${photometric}', which Tessera does not read`);
  if (bitsAllocated !== 8 && bitsAllocated !== 16) unsupported(`Bits Allocated is ${bitsAllocated}; Tessera reads 8 or 16`);
  const stored = bitsStored as number;
  const high = highBit as number;
  if (stored < 1 || stored > (bitsAllocated as number) || high < stored - 1 || high >= (bitsAllocated as number)) {
    unreadable(`Bits Stored ${stored} and High Bit ${high} do not fit Bits Allocated ${bitsAllocated}`);
  }
  if (ds.elements.x00283000 !== undefined && ds.elements.x00281053 === undefined) {
    unsupported('the image uses a Modality LUT Sequence (0028,3000), which Tessera does not apply');
  }

  const pixel = ds.elements.x7fe00010;
  if (pixel === undefined) unreadable('there is no Pixel Data (7FE0,0010)');
  if (pixel.encapsulatedPixelData) unreadable('the pixel data is encapsulated although the transfer syntax is uncompressed');
  const width = cols as number;
  const height = rows as number;
  const n = width * height;
  const bytesPer = (bitsAllocated as number) / 8;
  const source = ds.byteArray;
  if (pixel.dataOffset + n * bytesPer > source.length || pixel.length < n * bytesPer) {
    unreadable(`the pixel data holds ${Math.min(pixel.length, source.length - pixel.dataOffset)} bytes, expected ${n * bytesPer} for ${width} x ${height} (truncated file)`);
  }

  const slope = ds.floatString('x00281053') ?? 1;
  const intercept = ds.floatString('x00281052') ?? 0;
  if (!Number.isFinite(slope) || slope === 0 || !Number.isFinite(intercept)) unreadable(`Rescale Slope ${slope} / Intercept ${intercept} are not usable`);

  const bigEndian = syntax === '1.2.840.10008.1.2.2';
  const view = new DataView(source.buffer, source.byteOffset + pixel.dataOffset, n * bytesPer);
  const shift = high + 1 - stored;
  const mask = stored === 32 ? 0xffffffff : 2 ** stored - 1;
  const signBit = 2 ** (stored - 1);
  const storedMin = signed ? -signBit : 0;
  const storedMax = signed ? signBit - 1 : mask;
  const a = storedMin * slope + intercept;
  const b = storedMax * slope + intercept;
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  const invert = photometric === 'MONOCHROME1';
  const data = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const raw = bytesPer === 2 ? view.getUint16(2 * i, !bigEndian) : view.getUint8(i);
    let v = (raw >>> shift) & mask;
    if (signed && v >= signBit) v -= 2 * signBit;
    const m = v * slope + intercept;
    data[i] = invert ? lo + hi - m : m;
  }

  let window: DecodedImage['window'];
  const centre = ds.floatString('x00281050', 0);
  const widthValue = ds.floatString('x00281051', 0);
  if (centre !== undefined && widthValue !== undefined) {
    if (!Number.isFinite(centre) || !Number.isFinite(widthValue) || widthValue < 1) {
      unreadable(`Window Center ${centre} / Window Width ${widthValue} are not valid (PS3.3 C.11.2.1.2 requires width >= 1)`);
    }
    window = { centre: invert ? lo + hi - centre + 1 : centre, width: widthValue };
  }

  const spacingTag = ds.elements.x00280030 !== undefined ? 'x00280030' : 'x00181164';
  const rowSpacing = ds.floatString(spacingTag, 0);
  const colSpacing = ds.floatString(spacingTag, 1);
  const pixelSpacingMm: DecodedImage['pixelSpacingMm'] =
    rowSpacing !== undefined && colSpacing !== undefined && rowSpacing > 0 && colSpacing > 0 ? [rowSpacing, colSpacing] : undefined;

  const comments = ds.string('x00204000') ?? '';
  const synthetic = comments.startsWith(SYNTHETIC_MARKER) || (ds.string('x00080064') ?? '').trim() === 'SYN';

  return {
    width,
    height,
    data,
    format: 'dicom',
    bitDepth: stored,
    valueRange: [lo, hi],
    ...(window ? { window } : {}),
    ...(pixelSpacingMm ? { pixelSpacingMm } : {}),
    synthetic,
  };
}
