// Placeholder shell until the views land: the caution banner and the demo's first study with the
// map of its first sentence, so the end-to-end tests have a page to open.
import { useEffect, useRef, useState } from 'react';
import { loadStudy } from '../batch/study-inputs';
import { scoreStudy } from '../batch/score-set';
import { CautionBanner } from './views/CautionBanner';
import type { AppServices } from './inference/app-services';
import { contentHashOf } from './inference/inference-client';
import { createPageStudyEncoder } from './inference/page-study-encoder';
import { openModelFrom, openSetFrom } from './sources/open-folder';
import { formatShownProblem } from './sources/shown-problem';

interface FirstMap {
  readonly study: string;
  readonly sentence: string;
  readonly bestCell: { readonly row: number; readonly col: number };
  readonly grid: { readonly h: number; readonly w: number };
  readonly values: readonly number[];
  readonly image: { readonly width: number; readonly height: number; readonly data: Float32Array; readonly range: readonly [number, number] };
}

export function App({ services }: { services: AppServices }) {
  const [map, setMap] = useState<FirstMap>();
  const [problems, setProblems] = useState<string[]>([...services.setupProblems]);
  const [status, setStatus] = useState('opening the demo');
  const canvas = useRef<HTMLCanvasElement>(null);

  useEffect(() => {
    let live = true;
    (async () => {
      const demo = await services.demo;
      const [{ model, problems: mp }, { set, problems: sp }] = await Promise.all([openModelFrom(services.client, demo.model), openSetFrom(demo.set)]);
      if (!live) return;
      setProblems((p) => [...p, ...[...mp, ...sp].map(formatShownProblem)]);
      if (!model || !set || set.studies.length === 0) {
        setStatus('the demo could not be opened');
        return;
      }
      setStatus('encoding the first study');
      const loaded = await loadStudy(set, set.studies[0]);
      const encoder = createPageStudyEncoder(services.client, model);
      const embeddings = await services.client.encodeImage(model.hash, loaded.image, await contentHashOf(loaded.bytes));
      const { records, dumps } = await scoreStudy(encoder, loaded, embeddings, { dumpSimilarity: true });
      if (!live) return;
      const data = loaded.image.data;
      setMap({
        study: loaded.study.id,
        sentence: records[0].text,
        bestCell: records[0].bestCell,
        grid: model.grid,
        values: dumps[0].values,
        image: { width: loaded.image.width, height: loaded.image.height, data, range: loaded.image.valueRange },
      });
      setStatus('ready');
    })().catch((err: unknown) => {
      if (live) setProblems((p) => [...p, (err as Error).message]);
    });
    return () => {
      live = false;
    };
  }, [services]);

  useEffect(() => {
    const c = canvas.current;
    if (!c || !map) return;
    const { width, height, data, range } = map.image;
    c.width = width;
    c.height = height;
    const ctx = c.getContext('2d');
    if (!ctx) return;
    const px = ctx.createImageData(width, height);
    const span = range[1] - range[0] || 1;
    for (let i = 0; i < data.length; i++) {
      const v = Math.round(255 * Math.min(1, Math.max(0, (data[i] - range[0]) / span)));
      px.data.set([v, v, v, 255], i * 4);
    }
    ctx.putImageData(px, 0, 0);
    const lo = Math.min(...map.values);
    const hi = Math.max(...map.values);
    const cw = width / map.grid.w;
    const ch = height / map.grid.h;
    map.values.forEach((v, i) => {
      const t = hi > lo ? (v - lo) / (hi - lo) : 0;
      ctx.fillStyle = `rgba(255, 170, 0, ${(0.55 * t).toFixed(3)})`;
      ctx.fillRect((i % map.grid.w) * cw, Math.floor(i / map.grid.w) * ch, cw, ch);
    });
    ctx.strokeStyle = '#00e0ff';
    ctx.lineWidth = 3;
    ctx.strokeRect(map.bestCell.col * cw, map.bestCell.row * ch, cw, ch);
  }, [map]);

  return (
    <main>
      <CautionBanner />
      <p role="status" data-status={status}>Status: {status}</p>
      {problems.length > 0 && (
        <ul aria-label="Problems">
          {problems.map((p) => <li key={p}>{p}</li>)}
        </ul>
      )}
      {map && (
        <figure>
          <canvas ref={canvas} aria-label={`Map of the sentence "${map.sentence}" over study ${map.study}`} style={{ maxWidth: 448 }} />
          <figcaption data-best-cell={`${map.bestCell.row},${map.bestCell.col}`} data-study={map.study}>
            {map.study}: “{map.sentence}” — best cell row {map.bestCell.row}, column {map.bestCell.col}
          </figcaption>
        </figure>
      )}
    </main>
  );
}
