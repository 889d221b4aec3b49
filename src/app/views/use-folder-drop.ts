import { useState, type DragEvent } from 'react';
import type { FileSource } from '../../dataset/types';
import { sourcesFromDrop } from '../sources/drop-source';

/** Drag-and-drop of model or sample-set folders anywhere on the page (sources helper's sourcesFromDrop). */
export function useFolderDrop(onSource: (s: FileSource) => void, onProblem: (m: string) => void) {
  const [over, setOver] = useState(false);
  const handlers = {
    onDragOver(e: DragEvent) {
      if (!e.dataTransfer.types.includes('Files')) return;
      e.preventDefault();
      setOver(true);
    },
    onDragLeave(e: DragEvent) {
      if (e.currentTarget === e.target) setOver(false);
    },
    onDrop(e: DragEvent) {
      e.preventDefault();
      setOver(false);
      sourcesFromDrop(e.dataTransfer.items).then(
        ({ sources, problems }) => {
          problems.forEach(onProblem);
          sources.forEach(onSource);
        },
        (err: unknown) => onProblem((err as Error).message),
      );
    },
  };
  return { over, handlers };
}
