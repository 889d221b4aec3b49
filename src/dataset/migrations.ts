import { ANNOTATIONS_SCHEMA, SET_SCHEMA } from './types';
import { isObject } from './validate-json';

/**
 * Versions of our formats and how older ones become the current one.
 *
 * Sample set (set.json): 'tessera.set/1' is the first and current version; there is nothing to
 * migrate yet. A newer version is refused with a message to update Tessera.
 *
 * Annotations (annotations.json):
 * - 'tessera.annotations/1': { schema, set, boxes: [{ id, study, sentence_text, zone,
 *   bbox: [x1, y1, x2, y2] (corners in image pixels), annotator, created }] }, no sentence index or
 *   hash and no lung templates.
 * - 'tessera.annotations/2' (current): boxes carry sentence { index, text, hash } and box { x, y, w, h };
 *   optional lungs.
 */

export type VersionCheck =
  | { readonly kind: 'current' }
  | { readonly kind: 'older'; readonly version: number }
  | { readonly kind: 'newer'; readonly version: number }
  | { readonly kind: 'foreign'; readonly schema: unknown };

/** Classifies a schema string of the family 'tessera.<name>/<version>' against the current one. */
export function checkSchemaVersion(schema: unknown, current: string): VersionCheck {
  const family = current.slice(0, current.lastIndexOf('/') + 1);
  const currentVersion = Number(current.slice(family.length));
  if (typeof schema !== 'string' || !schema.startsWith(family)) return { kind: 'foreign', schema };
  const rest = schema.slice(family.length);
  if (!/^[1-9][0-9]*$/.test(rest)) return { kind: 'foreign', schema };
  const version = Number(rest);
  if (version === currentVersion) return { kind: 'current' };
  return version < currentVersion ? { kind: 'older', version } : { kind: 'newer', version };
}

export const SET_VERSION_CHECK = (schema: unknown): VersionCheck => checkSchemaVersion(schema, SET_SCHEMA);
export const ANNOTATIONS_VERSION_CHECK = (schema: unknown): VersionCheck => checkSchemaVersion(schema, ANNOTATIONS_SCHEMA);

/** Finds the index of the sentence a version-1 box was drawn on, by its text; undefined when none matches. */
export type SentenceResolver = (study: string, text: string) => number | undefined;

/**
 * Migrates a version-1 annotation file to the version-2 JSON shape. Corners become x, y, w, h
 * (w = x2 - x1, h = y2 - y1, so swapped corners give a negative size that validation reports);
 * the sentence index is resolved from the text by `resolve` and is -1 when no sentence matches
 * (validation then reports the box stale). The hash is filled in by `hash`. Records that are not
 * objects are passed through unchanged for validation to report.
 */
export function migrateAnnotationsV1ToV2(json: Record<string, unknown>, resolve: SentenceResolver, hash: (text: string) => string): Record<string, unknown> {
  const boxes = json.boxes;
  return {
    schema: ANNOTATIONS_SCHEMA,
    set: json.set,
    boxes: Array.isArray(boxes)
      ? boxes.map((b: unknown) => {
          if (!isObject(b)) return b;
          const { bbox, sentence_text: text, ...rest } = b;
          const corners = Array.isArray(bbox) && bbox.length === 4 && bbox.every((v) => typeof v === 'number') ? (bbox as number[]) : undefined;
          return {
            ...rest,
            sentence:
              typeof text === 'string' && typeof b.study === 'string'
                ? { index: resolve(b.study, text) ?? -1, text, hash: hash(text) }
                : text,
            box: corners ? { x: corners[0], y: corners[1], w: corners[2] - corners[0], h: corners[3] - corners[1] } : bbox,
          };
        })
      : boxes,
  };
}
