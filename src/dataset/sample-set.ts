import { LUNG_ZONES, type ZoneLabel } from '../core/types';
import { DatasetError, makeProblem, type Problem } from './errors';
import { SET_VERSION_CHECK } from './migrations';
import { SET_SCHEMA, type FileSource, type FindingLabel, type SampleSetManifest, type StudyRecord } from './types';
import { describeJson, isObject, isSafeRelativePath, unknownKeys } from './validate-json';

/** Every zone label a box or finding may carry, in display order. */
export const ZONE_LABELS: readonly ZoneLabel[] = [...LUNG_ZONES, 'cardiac', 'mediastinal', 'other'];

export const SET_FILE = 'set.json';

const TOP_KEYS = ['schema', 'name', 'synthetic', 'description', 'annotations', 'studies'] as const;
const STUDY_KEYS = ['id', 'image', 'report', 'labels'] as const;

export interface ManifestValidation {
  /** Undefined when the file cannot be used at all (see problems). */
  readonly manifest?: SampleSetManifest;
  readonly problems: readonly Problem[];
}

function validateFindings(v: unknown, file: string, item: string, problems: Problem[]): FindingLabel[] | undefined {
  const bad = (what: string): undefined => {
    problems.push(makeProblem('set-schema', file, item, what, 'make labels.findings a list of { "finding": text, "zones": [zone labels], "severity"?: number }'));
    return undefined;
  };
  if (!Array.isArray(v)) return bad(`labels.findings must be a list; got ${describeJson(v)}`);
  const out: FindingLabel[] = [];
  for (const [i, f] of v.entries()) {
    if (!isObject(f)) return bad(`labels.findings[${i}] must be an object; got ${describeJson(f)}`);
    if (typeof f.finding !== 'string' || f.finding.trim() === '') return bad(`labels.findings[${i}].finding must be non-empty text; got ${describeJson(f.finding)}`);
    if (!Array.isArray(f.zones) || !f.zones.every((z) => ZONE_LABELS.includes(z as ZoneLabel))) {
      return bad(`labels.findings[${i}].zones must be a list of ${ZONE_LABELS.join(', ')}; got ${JSON.stringify(f.zones)}`);
    }
    if (f.severity !== undefined && (typeof f.severity !== 'number' || !Number.isFinite(f.severity))) return bad(`labels.findings[${i}].severity must be a number; got ${describeJson(f.severity)}`);
    out.push(f as unknown as FindingLabel);
  }
  return out;
}

/** Validates one study record; returns it when usable (an empty report is usable but reported). */
function validateStudy(s: unknown, i: number, file: string, problems: Problem[]): StudyRecord | undefined {
  const path = `studies[${i}]`;
  if (!isObject(s)) {
    problems.push(makeProblem('set-schema', file, path, `the study must be an object; got ${describeJson(s)}`, 'write each study as { "id", "image", "report" }'));
    return undefined;
  }
  const id = typeof s.id === 'string' && s.id.trim() !== '' ? s.id : undefined;
  const item = id ?? path;
  const before = problems.length;
  const schemaProblem = (what: string, fix: string): void => {
    problems.push(makeProblem('set-schema', file, item, what, fix));
  };
  if (id === undefined) schemaProblem(`"id" must be non-empty text; got ${describeJson(s.id)}`, 'give the study a unique id such as "s0001"');
  else if (id !== id.trim()) schemaProblem(`"id" has leading or trailing spaces: ${JSON.stringify(id)}`, 'remove the spaces from the id');
  if (typeof s.image !== 'string') schemaProblem(`"image" must be a path; got ${describeJson(s.image)}`, 'set "image" to the image path relative to the set folder, e.g. "images/s0001.png"');
  else if (!isSafeRelativePath(s.image)) schemaProblem(`"image" must be a path inside the set folder using '/'; got ${JSON.stringify(s.image)}`, "use a relative path without '..', a leading '/' or backslashes");
  if (typeof s.report !== 'string') schemaProblem(`"report" must be text; got ${describeJson(s.report)}`, 'put the report text in "report"');
  for (const k of unknownKeys(s, STUDY_KEYS)) schemaProblem(`unknown field "${k}"`, `remove "${k}" or move it under "labels" (allowed fields: ${STUDY_KEYS.join(', ')})`);
  if (s.labels !== undefined) {
    if (!isObject(s.labels)) schemaProblem(`"labels" must be an object; got ${describeJson(s.labels)}`, 'write labels as an object, e.g. { "findings": [] }');
    else {
      if (s.labels.findings !== undefined) validateFindings(s.labels.findings, file, item, problems);
      const grade = s.labels.edema_grade;
      if (grade !== undefined && !(typeof grade === 'number' && Number.isInteger(grade) && grade >= 0 && grade <= 3)) {
        schemaProblem(`labels.edema_grade must be an integer 0-3; got ${describeJson(grade)}`, 'use 0 (none) to 3 (severe)');
      }
    }
  }
  if (problems.length > before) return undefined;
  if ((s.report as string).trim() === '') {
    problems.push(makeProblem('empty-report', file, item, 'the report is empty', 'paste the report text into "report", or remove the study'));
  }
  return s as unknown as StudyRecord;
}

/**
 * Validates parsed set.json content by hand (the same rules as schemas/set.schema.json, plus unique
 * study ids and non-empty reports), collecting every problem. File-level failures (wrong schema,
 * missing name, studies not a list) leave `manifest` undefined; a study with a problem is reported
 * and left out of manifest.studies while the others load. `file` names the file in messages.
 */
export function validateSampleSetManifest(json: unknown, file: string): ManifestValidation {
  const problems: Problem[] = [];
  if (!isObject(json)) {
    problems.push(makeProblem('set-schema', file, '', `the file must hold a JSON object; got ${describeJson(json)}`, `write set.json as { "schema": "${SET_SCHEMA}", "name", "synthetic", "studies": [...] }`));
    return { problems };
  }
  const version = SET_VERSION_CHECK(json.schema);
  if (version.kind === 'newer') {
    problems.push(makeProblem('set-schema', file, 'schema', `the set was written in version ${version.version} of the format, newer than this Tessera (${SET_SCHEMA})`, 'update Tessera to a version that reads this set'));
    return { problems };
  }
  if (version.kind !== 'current') {
    problems.push(makeProblem('set-schema', file, 'schema', `"schema" must be "${SET_SCHEMA}"; got ${describeJson(json.schema)}`, `set "schema" to "${SET_SCHEMA}" if this is a Tessera sample set`));
    return { problems };
  }
  let fatal = false;
  const top = (item: string, what: string, fix: string, isFatal: boolean): void => {
    problems.push(makeProblem('set-schema', file, item, what, fix));
    fatal ||= isFatal;
  };
  if (typeof json.name !== 'string' || json.name.trim() === '') top('name', `"name" must be non-empty text; got ${describeJson(json.name)}`, 'give the set a name, e.g. "demo"', true);
  if (typeof json.synthetic !== 'boolean') top('synthetic', `"synthetic" must be true or false; got ${describeJson(json.synthetic)}`, 'set "synthetic": true for generated data, false otherwise', true);
  if (json.description !== undefined && typeof json.description !== 'string') top('description', `"description" must be text; got ${describeJson(json.description)}`, 'make "description" a string or remove it', true);
  if (json.annotations !== undefined && !(typeof json.annotations === 'string' && isSafeRelativePath(json.annotations))) {
    top('annotations', `"annotations" must be a path inside the set folder; got ${describeJson(json.annotations)}`, 'use a relative path such as "annotations.json"', true);
  }
  for (const k of unknownKeys(json, TOP_KEYS)) top(k, `unknown field "${k}"`, `remove "${k}" (allowed fields: ${TOP_KEYS.join(', ')})`, true);
  if (!Array.isArray(json.studies)) {
    top('studies', `"studies" must be a list; got ${describeJson(json.studies)}`, 'list the studies as "studies": [{ "id", "image", "report" }, ...]', true);
    return { problems };
  }
  const studies: StudyRecord[] = [];
  const firstIndex = new Map<string, number>();
  const duplicated = new Set<string>();
  json.studies.forEach((s, i) => {
    const study = validateStudy(s, i, file, problems);
    if (!study) return;
    const first = firstIndex.get(study.id);
    if (first !== undefined) {
      duplicated.add(study.id);
      problems.push(makeProblem('duplicate-study', file, study.id, `the study id is used more than once (studies[${first}] and studies[${i}])`, 'give every study its own id'));
      return;
    }
    firstIndex.set(study.id, i);
    studies.push(study);
  });
  if (fatal) return { problems };
  const manifest: SampleSetManifest = {
    schema: SET_SCHEMA,
    name: json.name as string,
    synthetic: json.synthetic as boolean,
    ...(json.description !== undefined ? { description: json.description as string } : {}),
    ...(json.annotations !== undefined ? { annotations: json.annotations as string } : {}),
    studies: studies.filter((s) => !duplicated.has(s.id) && s.report.trim() !== ''),
  };
  return { manifest, problems };
}

/**
 * Reads and validates set.json from a sample-set folder, and checks that every study's image
 * exists. Returns the manifest of the studies that can load, and every problem found (a study with
 * a problem is named in it and left out). Throws DatasetError when set.json is missing, is not
 * JSON, or cannot be used at all; its `problems` lists everything found.
 */
export async function loadSampleSet(source: FileSource): Promise<{ manifest: SampleSetManifest; problems: Problem[] }> {
  const file = `${source.label}/${SET_FILE}`;
  if (!(await source.exists(SET_FILE))) {
    throw new DatasetError('there is no set.json in the folder', { code: 'set-schema', file, fix: 'choose a sample-set folder (one with set.json), or create one with "tessera phantom"' });
  }
  let json: unknown;
  try {
    json = JSON.parse(await source.readText(SET_FILE));
  } catch (cause) {
    throw new DatasetError(`the file is not valid JSON (${cause instanceof Error ? cause.message : String(cause)})`, { code: 'set-json', file, fix: 'correct the JSON syntax (a JSON validator shows the line)', cause });
  }
  const { manifest, problems } = validateSampleSetManifest(json, file);
  if (manifest === undefined) {
    const first = problems[0];
    throw new DatasetError(`the sample set cannot be used (${problems.length} problem${problems.length === 1 ? '' : 's'}; first: ${first.message})`, {
      code: 'set-schema',
      file,
      item: first.item,
      fix: first.fix,
      problems,
    });
  }
  const all = [...problems];
  const present: StudyRecord[] = [];
  const checks = await Promise.all(manifest.studies.map((s) => source.exists(s.image)));
  manifest.studies.forEach((s, i) => {
    if (checks[i]) present.push(s);
    else all.push(makeProblem('missing-image', file, s.id, `the image "${s.image}" does not exist in ${source.label}`, `copy the image to ${source.label}/${s.image}, or correct "image"`));
  });
  return { manifest: { ...manifest, studies: present }, problems: all };
}
