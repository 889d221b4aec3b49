/**
 * Writes synthetic single-frame greyscale images as DICOM Part 10 files (PS3.10 section 7) in
 * Explicit VR Little Endian, as Secondary Capture Image Storage with Conversion Type 'SYN'
 * (synthetic image, PS3.3 C.8.6.1). Every file is marked synthetic in several places so it can
 * never be mistaken for patient data.
 */

export const EXPLICIT_VR_LITTLE_ENDIAN = '1.2.840.10008.1.2.1';
export const SECONDARY_CAPTURE_SOP_CLASS = '1.2.840.10008.5.1.4.1.1.7';
/** Implementation Class UID of this writer, under the UUID-derived root 2.25 (PS3.5 B.2). */
export const TESSERA_IMPLEMENTATION_UID = deterministicUid('tessera implementation');
/** Patient Name written into every synthetic file. */
export const SYNTHETIC_PATIENT_NAME = 'SYNTHETIC^PHANTOM';
/** Leading text of Image Comments in every synthetic file; the reader looks for it. */
export const SYNTHETIC_MARKER = 'TESSERA SYNTHETIC PHANTOM - NOT PATIENT DATA';

export interface DicomEncodeInput {
  readonly width: number;
  readonly height: number;
  /** Row-major stored values (before the modality LUT), width * height of them. */
  readonly data: Uint16Array;
  readonly bitsStored?: number;
  readonly photometric: 'MONOCHROME1' | 'MONOCHROME2';
  /** [row spacing, column spacing] in mm, as Pixel Spacing (0028,0030) orders them. */
  readonly pixelSpacingMm: readonly [number, number];
  /** VOI window in modality units (after rescale). */
  readonly window?: { readonly centre: number; readonly width: number };
  readonly rescale?: { readonly slope: number; readonly intercept: number };
  readonly studyId: string;
  readonly description: string;
}

/**
 * A UID under root 2.25 (PS3.5 B.2: a UUID as one decimal integer) whose integer is a 128-bit
 * FNV-1a hash of `seed`, so the same seed always gives the same UID (at most 44 characters).
 */
export function deterministicUid(seed: string): string {
  const prime = 0x0000000001000000000000000000013bn;
  const mask = (1n << 128n) - 1n;
  let h = 0x6c62272e07bb014262b821756295c58dn;
  const bytes = new TextEncoder().encode(seed);
  for (const b of bytes) {
    h ^= BigInt(b);
    h = (h * prime) & mask;
  }
  return `2.25.${h.toString(10)}`;
}

function fnv32(data: Uint16Array): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < data.length; i++) {
    h = Math.imul(h ^ (data[i] & 0xff), 0x01000193);
    h = Math.imul(h ^ (data[i] >> 8), 0x01000193);
  }
  return (h >>> 0).toString(16);
}

type Vr = 'UI' | 'OB' | 'OW' | 'UL' | 'US' | 'CS' | 'DS' | 'IS' | 'LO' | 'LT' | 'PN' | 'SH' | 'DA' | 'TM';

interface Element {
  readonly group: number;
  readonly element: number;
  readonly vr: Vr;
  readonly value: Uint8Array;
}

const LONG_VRS = new Set<Vr>(['OB', 'OW']);

function asciiBytes(s: string, pad: number, what: string): Uint8Array {
  const out = new Uint8Array(s.length + (s.length % 2));
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x20 || c > 0x7e) throw new RangeError(`${what} must be printable ASCII; got character code ${c}`);
    out[i] = c;
  }
  if (s.length % 2) out[s.length] = pad;
  return out;
}

function str(group: number, element: number, vr: Vr, value: string, what = `(${group.toString(16)},${element.toString(16)})`): Element {
  return { group, element, vr, value: asciiBytes(value, vr === 'UI' ? 0 : 0x20, what) };
}

function us(group: number, element: number, value: number): Element {
  const v = new Uint8Array(2);
  new DataView(v.buffer).setUint16(0, value, true);
  return { group, element, vr: 'US', value: v };
}

function ul(group: number, element: number, value: number): Element {
  const v = new Uint8Array(4);
  new DataView(v.buffer).setUint32(0, value, true);
  return { group, element, vr: 'UL', value: v };
}

/** Decimal String (PS3.5 6.2): at most 16 characters per value. */
function ds(values: readonly number[], what: string): string {
  return values
    .map((v) => {
      if (!Number.isFinite(v)) throw new RangeError(`${what} must be finite; got ${v}`);
      for (let p = 10; p >= 1; p--) {
        const s = String(Number(v.toPrecision(p)));
        if (s.length <= 16) return s;
      }
      throw new RangeError(`${what} cannot be written as a 16-character decimal string; got ${v}`);
    })
    .join('\\');
}

function encodeElements(elements: readonly Element[]): Uint8Array {
  const sorted = [...elements].sort((a, b) => a.group - b.group || a.element - b.element);
  const size = sorted.reduce((s, e) => s + (LONG_VRS.has(e.vr) ? 12 : 8) + e.value.length, 0);
  const out = new Uint8Array(size);
  const view = new DataView(out.buffer);
  let p = 0;
  for (const e of sorted) {
    view.setUint16(p, e.group, true);
    view.setUint16(p + 2, e.element, true);
    out[p + 4] = e.vr.charCodeAt(0);
    out[p + 5] = e.vr.charCodeAt(1);
    if (LONG_VRS.has(e.vr)) {
      view.setUint32(p + 8, e.value.length, true);
      p += 12;
    } else {
      view.setUint16(p + 6, e.value.length, true);
      p += 8;
    }
    out.set(e.value, p);
    p += e.value.length;
  }
  return out;
}

/**
 * Encodes one synthetic greyscale image as a DICOM Part 10 file: 128-byte preamble, 'DICM', the
 * file meta group (Explicit VR Little Endian), then the data set with 16 bits allocated, unsigned
 * pixels. UIDs derive from studyId (and the pixels, for the SOP instance), so output is
 * byte-identical for the same input. Throws RangeError naming the parameter on bad input.
 */
export function encodeDicom({
  width,
  height,
  data,
  bitsStored = 16,
  photometric,
  pixelSpacingMm,
  window,
  rescale,
  studyId,
  description,
}: DicomEncodeInput): Uint8Array {
  if (!Number.isInteger(width) || width < 1 || width > 65535) throw new RangeError(`'width' must be an integer in [1, 65535]; got ${width}`);
  if (!Number.isInteger(height) || height < 1 || height > 65535) throw new RangeError(`'height' must be an integer in [1, 65535]; got ${height}`);
  if (!(data instanceof Uint16Array)) throw new TypeError(`'data' must be a Uint16Array; got ${Object.prototype.toString.call(data)}`);
  if (data.length !== width * height) throw new RangeError(`'data' must hold width * height = ${width * height} values; got ${data.length}`);
  if (!Number.isInteger(bitsStored) || bitsStored < 1 || bitsStored > 16) throw new RangeError(`'bitsStored' must be an integer in [1, 16]; got ${bitsStored}`);
  const limit = 2 ** bitsStored;
  for (let i = 0; i < data.length; i++) {
    if (data[i] >= limit) throw new RangeError(`'data' values must fit in bitsStored = ${bitsStored} bits; got ${data[i]} at index ${i}`);
  }
  if (photometric !== 'MONOCHROME1' && photometric !== 'MONOCHROME2') throw new RangeError(`'photometric' must be 'MONOCHROME1' or 'MONOCHROME2'; got ${photometric}`);
  if (pixelSpacingMm.length !== 2 || !pixelSpacingMm.every((v) => Number.isFinite(v) && v > 0)) throw new RangeError(`'pixelSpacingMm' must be two positive numbers; got [${pixelSpacingMm.join(', ')}]`);
  if (window !== undefined && !(Number.isFinite(window.centre) && Number.isFinite(window.width) && window.width >= 1)) throw new RangeError(`'window' must have a finite centre and a width >= 1; got centre ${window.centre}, width ${window.width}`);
  if (rescale !== undefined && !(Number.isFinite(rescale.slope) && rescale.slope !== 0 && Number.isFinite(rescale.intercept))) throw new RangeError(`'rescale' must have a finite non-zero slope and a finite intercept; got slope ${rescale.slope}, intercept ${rescale.intercept}`);
  if (studyId.length < 1 || studyId.length > 64) throw new RangeError(`'studyId' must be 1-64 characters; got ${studyId.length}`);

  const studyUid = deterministicUid(`study:${studyId}`);
  const seriesUid = deterministicUid(`series:${studyId}`);
  const instanceUid = deterministicUid(`instance:${studyId}:${width}x${height}:${fnv32(data)}`);

  const metaBody: Element[] = [
    { group: 2, element: 1, vr: 'OB', value: Uint8Array.of(0, 1) },
    str(2, 2, 'UI', SECONDARY_CAPTURE_SOP_CLASS),
    str(2, 3, 'UI', instanceUid),
    str(2, 0x10, 'UI', EXPLICIT_VR_LITTLE_ENDIAN),
    str(2, 0x12, 'UI', TESSERA_IMPLEMENTATION_UID),
    str(2, 0x13, 'SH', 'TESSERA_0_1'),
  ];
  const metaBytes = encodeElements(metaBody);
  const meta = encodeElements([ul(2, 0, metaBytes.length), ...metaBody]);

  const pixelBytes = new Uint8Array(data.length * 2);
  const pv = new DataView(pixelBytes.buffer);
  for (let i = 0; i < data.length; i++) pv.setUint16(2 * i, data[i], true);

  const elements: Element[] = [
    str(8, 8, 'CS', 'DERIVED\\SECONDARY'),
    str(8, 0x16, 'UI', SECONDARY_CAPTURE_SOP_CLASS),
    str(8, 0x18, 'UI', instanceUid),
    str(8, 0x20, 'DA', ''),
    str(8, 0x30, 'TM', ''),
    str(8, 0x50, 'SH', ''),
    str(8, 0x60, 'CS', 'OT'),
    str(8, 0x64, 'CS', 'SYN'),
    str(8, 0x70, 'LO', 'Tessera phantom generator'),
    str(8, 0x90, 'PN', ''),
    str(8, 0x1030, 'LO', description.slice(0, 64), "'description'"),
    str(0x10, 0x10, 'PN', SYNTHETIC_PATIENT_NAME),
    str(0x10, 0x20, 'LO', studyId, "'studyId'"),
    str(0x10, 0x30, 'DA', ''),
    str(0x10, 0x40, 'CS', ''),
    str(0x12, 0x62, 'CS', 'YES'),
    str(0x20, 0x0d, 'UI', studyUid),
    str(0x20, 0x0e, 'UI', seriesUid),
    str(0x20, 0x10, 'SH', studyId.slice(0, 16), "'studyId'"),
    str(0x20, 0x11, 'IS', '1'),
    str(0x20, 0x13, 'IS', '1'),
    // Columns run toward the patient's left, rows toward the feet: a frontal view as displayed.
    str(0x20, 0x20, 'CS', 'L\\F'),
    str(0x20, 0x4000, 'LT', `${SYNTHETIC_MARKER}. ${description}`, "'description'"),
    us(0x28, 2, 1),
    str(0x28, 4, 'CS', photometric),
    us(0x28, 0x10, height),
    us(0x28, 0x11, width),
    str(0x28, 0x30, 'DS', ds(pixelSpacingMm, "'pixelSpacingMm'")),
    us(0x28, 0x100, 16),
    us(0x28, 0x101, bitsStored),
    us(0x28, 0x102, bitsStored - 1),
    us(0x28, 0x103, 0),
    str(0x28, 0x301, 'CS', 'NO'),
    { group: 0x7fe0, element: 0x10, vr: 'OW', value: pixelBytes },
  ];
  if (window) {
    elements.push(str(0x28, 0x1050, 'DS', ds([window.centre], "'window.centre'")));
    elements.push(str(0x28, 0x1051, 'DS', ds([window.width], "'window.width'")));
  }
  if (rescale) {
    elements.push(str(0x28, 0x1052, 'DS', ds([rescale.intercept], "'rescale.intercept'")));
    elements.push(str(0x28, 0x1053, 'DS', ds([rescale.slope], "'rescale.slope'")));
    elements.push(str(0x28, 0x1054, 'LO', 'US'));
  }
  const body = encodeElements(elements);

  const out = new Uint8Array(128 + 4 + meta.length + body.length);
  out.set([0x44, 0x49, 0x43, 0x4d], 128);
  out.set(meta, 132);
  out.set(body, 132 + meta.length);
  return out;
}
