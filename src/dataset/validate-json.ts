/** Small helpers for hand validation of our JSON formats; each returns a description or undefined. */

export type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

export function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export function describeJson(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'an array';
  if (typeof v === 'string') return `the string ${JSON.stringify(v.length > 40 ? v.slice(0, 40) + '...' : v)}`;
  return typeof v === 'object' ? 'an object' : `${typeof v} ${String(v)}`;
}

/** A '/'-separated path relative to a folder: no leading '/', no drive letter, no '..' or '.' segment, no backslash. */
export function isSafeRelativePath(path: string): boolean {
  if (path === '' || path.startsWith('/') || /^[A-Za-z]:/.test(path) || path.includes('\\')) return false;
  return path.split('/').every((seg) => seg !== '' && seg !== '.' && seg !== '..');
}

/** Keys of `obj` not in `allowed`. */
export function unknownKeys(obj: Record<string, unknown>, allowed: readonly string[]): string[] {
  return Object.keys(obj).filter((k) => !allowed.includes(k));
}
