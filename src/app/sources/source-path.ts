/**
 * Splits a FileSource path ('images/a.png') into its segments, refusing paths that could leave the
 * folder: absolute paths, empty segments, '.' and '..'.
 */
export function pathSegments(path: string): string[] {
  if (typeof path !== 'string' || path === '') throw new TypeError(`'path' must be a non-empty relative path; got '${String(path)}'`);
  const parts = path.replace(/\\/g, '/').split('/');
  if (path.startsWith('/') || parts.some((p) => p === '' || p === '.' || p === '..')) {
    throw new TypeError(`'path' must be a relative path inside the folder, with '/' between names and no '.' or '..'; got '${path}'`);
  }
  return parts;
}
