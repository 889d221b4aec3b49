import { useRef } from 'react';
import type { FileSource } from '../../dataset/types';
import { directoryPickerAvailable, pickDirectory } from '../sources/directory-handle-source';
import { createFileListSource } from '../sources/file-list-source';

export interface SourcesBarProps {
  readonly modelLabel: string | undefined;
  readonly setLabel: string | undefined;
  readonly onModel: (source: FileSource) => void;
  readonly onSet: (source: FileSource) => void;
  readonly onProblem: (message: string) => void;
}

function FolderButton({ label, onSource, onProblem }: { label: string; onSource: (s: FileSource) => void; onProblem: (m: string) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const open = async () => {
    if (!directoryPickerAvailable()) {
      input.current?.click();
      return;
    }
    try {
      const s = await pickDirectory();
      if (s) onSource(s);
    } catch (err) {
      onProblem((err as Error).message);
    }
  };
  return (
    <>
      <button type="button" className="t-button" onClick={() => void open()} title={`${label} You can also drop the folder on the page.`}>
        {label}
      </button>
      <input
        ref={input}
        type="file"
        hidden
        aria-hidden="true"
        tabIndex={-1}
        {...{ webkitdirectory: '', directory: '' }}
        multiple
        onChange={(e) => {
          const files = e.target.files;
          if (!files || files.length === 0) return;
          try {
            onSource(createFileListSource(files));
          } catch (err) {
            onProblem((err as Error).message);
          }
          e.target.value = '';
        }}
      />
    </>
  );
}

/** Opens the researcher's own model folder and sample-set folder from disk; nothing is uploaded. */
export function SourcesBar({ modelLabel, setLabel, onModel, onSet, onProblem }: SourcesBarProps) {
  return (
    <div className="t-sources" role="group" aria-label="Open folders">
      <span className="t-sources__item">
        <span className="t-sources__k">Model</span> <span className="t-sources__v">{modelLabel ?? 'none'}</span>
        <FolderButton label="Open model folder…" onSource={onModel} onProblem={onProblem} />
      </span>
      <span className="t-sources__item">
        <span className="t-sources__k">Sample set</span> <span className="t-sources__v">{setLabel ?? 'none'}</span>
        <FolderButton label="Open sample-set folder…" onSource={onSet} onProblem={onProblem} />
      </span>
      <span className="t-hint">or drop either folder on the page</span>
    </div>
  );
}
