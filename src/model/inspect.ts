import type { FileSource } from '../dataset/types';
import { ModelContractError, formatProblem, type Problem } from './contract';
import { checkImageOutput } from './output-checks';
import { loadModelFolder, probeImage, probeModel, type ProbeRun, type TokenizerFactory } from './model-folder';
import { preprocessImage, stackImageTensors } from './preprocess';
import type { InferenceEngine, ModelManifest } from './types';

export interface InspectReport {
  /** True when the folder meets the contract: no problems. */
  readonly ok: boolean;
  readonly folder: string;
  readonly engine: string;
  readonly manifest?: ModelManifest;
  readonly hash?: string;
  /** Milliseconds to read the files and create both sessions. */
  readonly loadMs?: number;
  readonly image?: ProbeRun;
  readonly text?: ProbeRun;
  /** Whether the image encoder accepts a batch of two (a dynamic batch axis); undefined when not tried. */
  readonly batchOfTwo?: boolean;
  readonly problems: readonly Problem[];
  /** Observations that do not break the contract. */
  readonly notes: readonly string[];
}

export interface InspectOptions {
  readonly tokenizerFactory: TokenizerFactory;
  /** Millisecond clock for the timings (e.g. () => performance.now()). */
  readonly now: () => number;
  readonly threads?: number;
}

/**
 * Validates a model folder against the contract and runs one probe image and one probe sentence
 * through the encoders, reporting shapes, timings and every mismatch. Never throws for a broken
 * folder: the problems are in the report.
 */
export async function inspectModel(source: FileSource, engine: InferenceEngine, { tokenizerFactory, now, threads = 2 }: InspectOptions): Promise<InspectReport> {
  const base = { folder: source.label, engine: engine.name };
  const t0 = now();
  let loaded;
  try {
    loaded = await loadModelFolder(source, engine, { threads, tokenizerFactory });
  } catch (err) {
    if (err instanceof ModelContractError) return { ...base, ok: false, problems: err.problems, notes: [] };
    throw err;
  }
  const loadMs = now() - t0;
  const notes: string[] = [];
  try {
    const probe = await probeModel(loaded, now);
    let batchOfTwo: boolean | undefined;
    if (probe.problems.length === 0) {
      const input = loaded.manifest.image.input;
      const one = preprocessImage(probeImage(input.width, input.height), input).tensor;
      try {
        const out = await loaded.imageSession.run({ [input.name]: stackImageTensors([one, one]) });
        batchOfTwo = checkImageOutput(loaded.manifest, out[loaded.manifest.image.output.name], 2).length === 0;
      } catch {
        batchOfTwo = false;
      }
      if (!batchOfTwo) notes.push('The image encoder does not take a batch of 2 images (fixed batch axis): encode with batchSize 1, or export with a dynamic batch axis to go faster.');
    }
    if (loaded.manifest.hashes === undefined) notes.push('The manifest gives no file hashes: add "hashes" so a changed file is detected.');
    if (loaded.manifest.synthetic_demo) notes.push('This is a synthetic demo model: its results show the tool working, not a real model\'s grounding.');
    return {
      ...base,
      ok: probe.problems.length === 0,
      manifest: loaded.manifest,
      hash: loaded.hash,
      loadMs,
      ...(probe.image ? { image: probe.image } : {}),
      ...(probe.text ? { text: probe.text } : {}),
      ...(batchOfTwo !== undefined ? { batchOfTwo } : {}),
      problems: probe.problems,
      notes,
    };
  } finally {
    await Promise.all([loaded.imageSession.release(), loaded.textSession.release()]);
  }
}

const dimsText = (d: readonly number[]): string => `[${d.join(', ')}]`;
const msText = (ms: number): string => `${ms.toFixed(1)} ms`;

function runLine(label: string, file: string, run: ProbeRun | undefined): string {
  if (run === undefined) return `${label} ${file}: not run`;
  const ins = Object.entries(run.inputs).map(([k, d]) => `${k} ${dimsText(d)}`).join(', ');
  const out = run.output ? `${run.output.name} ${dimsText(run.output.dims)}` : 'no declared output';
  return `${label} ${file}: ${ins} -> ${out} in ${msText(run.ms)}`;
}

/** The report as lines for the CLI: what was found, then one line per problem, then the verdict. */
export function formatInspectReport(report: InspectReport): string {
  const lines = [`Model folder: ${report.folder}`, `Runtime: ${report.engine}`];
  const m = report.manifest;
  if (m) {
    lines.push(`Manifest: valid (${m.schema}), id "${m.id}", embedding_dim ${m.embedding_dim}, similarity ${m.similarity}${m.temperature !== undefined ? `, temperature ${m.temperature}` : ''}`);
    const i = m.image.input;
    lines.push(`Image input: ${i.channels} channel(s), ${i.width} x ${i.height}, resize ${i.resize}, scale ${i.scale}, mean [${i.mean.join(', ')}], std [${i.std.join(', ')}]`);
    lines.push(`Image output: layout ${m.image.output.layout}, grid ${m.image.output.grid.h} x ${m.image.output.grid.w}`);
    const o = m.text.output;
    lines.push(`Text output: kind ${o.kind}${o.pooling ? `, pooling ${o.pooling}` : ''}, max_tokens ${m.text.max_tokens}`);
    if (report.hash) lines.push(`Model hash: ${report.hash}`);
    if (report.loadMs !== undefined) lines.push(`Loaded in ${msText(report.loadMs)}`);
    lines.push(runLine('Image encoder', m.image.file, report.image));
    lines.push(runLine('Text encoder', m.text.file, report.text));
    if (report.batchOfTwo !== undefined) lines.push(`Batch of 2 images: ${report.batchOfTwo ? 'accepted' : 'refused'}`);
  }
  for (const n of report.notes) lines.push(`Note: ${n}`);
  if (report.problems.length > 0) {
    lines.push(`Problems (${report.problems.length}):`);
    for (const p of report.problems) lines.push(`  - ${formatProblem(p)}`);
    lines.push('Result: the folder does not meet the model contract.');
  } else {
    lines.push('Result: OK, the folder meets the model contract.');
  }
  return `${lines.join('\n')}\n`;
}
