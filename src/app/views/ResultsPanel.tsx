import { useEffect, useState } from 'react';
import type { ScoreSummary, SentenceRecord } from '../../batch/types';
import { buildTables, runLine, type TableContent } from '../../batch/export-tables-content';
import { writeScoreOutputs } from '../../batch/write-score-outputs';
import { createMemorySink, downloadFile } from './download-file';

export interface ResultsPanelProps {
  readonly result: { readonly summary: ScoreSummary; readonly records: readonly SentenceRecord[] } | undefined;
  /** Extra downloads beside the score files (annotation file, COCO JSON). */
  readonly extraDownloads?: readonly { readonly label: string; readonly file: string; readonly make: () => string | Uint8Array }[];
}

function FigureImage({ name, png }: { readonly name: string; readonly png: Uint8Array }) {
  const [url, setUrl] = useState<string | undefined>();
  useEffect(() => {
    const u = URL.createObjectURL(new Blob([new Uint8Array(png)], { type: 'image/png' }));
    setUrl(u);
    return () => URL.revokeObjectURL(u);
  }, [png]);
  return <figure className="t-figure">{url && <img src={url} alt={`Figure ${name}`} />}<figcaption>{name}</figcaption></figure>;
}

function ResultTable({ table }: { readonly table: TableContent }) {
  return (
    <figure className="t-table">
      <figcaption>
        <strong>{table.id}.</strong> {table.title}
      </figcaption>
      {table.rows.length === 0 ? (
        <p className="t-status">{table.empty}</p>
      ) : (
        <table>
          <thead>
            <tr>
              {table.columns.map((c) => (
                <th key={c.md} className={c.align === 'r' ? 't-num' : undefined} scope="col">
                  {c.md}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((row, i) => (
              <tr key={i}>
                {row.map((cell, j) => (
                  <td key={j} className={table.columns[j]?.align === 'r' ? 't-num' : undefined}>
                    {cell}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p className="t-hint">{table.note}</p>
    </figure>
  );
}

/**
 * The score tables of the last run (src/batch buildTables) and every output file the CLI's
 * `score` writes (src/batch writeScoreOutputs into memory), each as a download.
 */
export function ResultsPanel({ result, extraDownloads = [] }: ResultsPanelProps) {
  const [files, setFiles] = useState<Map<string, Uint8Array | string> | undefined>();
  const [problem, setProblem] = useState<string | undefined>();
  useEffect(() => {
    setFiles(undefined);
    setProblem(undefined);
    if (!result) return;
    let live = true;
    const sink = createMemorySink();
    writeScoreOutputs(result.summary, result.records, undefined, sink).then(
      () => live && setFiles(sink.files),
      (err: unknown) => live && setProblem((err as Error).message),
    );
    return () => {
      live = false;
    };
  }, [result]);

  return (
    <div className="t-results">
      <div className="t-results__downloads" role="group" aria-label="Downloads">
        {files &&
          [...files.entries()].map(([path, data]) => (
            <button key={path} type="button" className="t-button" onClick={() => downloadFile(path, data)}>
              Download {path}
            </button>
          ))}
        {extraDownloads.map((d) => (
          <button key={d.file} type="button" className="t-button" onClick={() => downloadFile(d.file, d.make())}>
            {d.label}
          </button>
        ))}
      </div>
      {problem && <p className="t-error">{problem}</p>}
      {!result ? (
        <p className="t-status">No results yet: score the set first (Score the set).</p>
      ) : (
        <>
          <p className="t-runline">{runLine(result.summary)}</p>
          <div className="t-results__tables">
            {buildTables(result.summary).map((t) => (
              <ResultTable key={t.id} table={t} />
            ))}
          </div>
          {files && (
            <div className="t-results__figures">
              {[...files.entries()]
                .filter(([path, data]) => path.endsWith('.png') && typeof data !== 'string')
                .map(([path, data]) => (
                  <FigureImage key={path} name={path} png={data as Uint8Array} />
                ))}
            </div>
          )}
        </>
      )}
    </div>
  );
}
