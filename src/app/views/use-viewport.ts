import { useCallback, useEffect, useState } from 'react';
import type { Size } from '../../core/types';
import { fitViewport, panBy, zoomAbout, type CanvasPoint, type Viewport } from '../draw';

const FIT_MARGIN = 12;
const STEP = 1.25;

/**
 * The canvas viewport (draw module's Viewport): fitted when the image or the canvas size changes
 * or when asked, zoomed about a canvas point, panned by canvas pixels.
 */
export function useViewport(image: Size | undefined, canvas: Size, request: { how: 'in' | 'out' | 'fit'; n: number }) {
  const [viewport, setViewport] = useState<Viewport>({ scale: 1, offsetX: 0, offsetY: 0 });
  const fit = useCallback(() => {
    if (!image || canvas.width <= 2 * FIT_MARGIN || canvas.height <= 2 * FIT_MARGIN) return;
    setViewport(fitViewport(image, canvas, { margin: FIT_MARGIN }));
  }, [image, canvas]);
  useEffect(fit, [fit]);
  useEffect(() => {
    if (request.n === 0) return;
    if (request.how === 'fit') fit();
    else {
      const centre = { canvasX: canvas.width / 2, canvasY: canvas.height / 2 };
      setViewport((v) => zoomAbout(v, centre, request.how === 'in' ? STEP : 1 / STEP));
    }
    // Only a new request (its counter) acts; size changes refit through `fit` above.
  }, [request.n]);
  const zoomAt = useCallback((at: CanvasPoint, deltaY: number) => setViewport((v) => zoomAbout(v, at, deltaY < 0 ? STEP : 1 / STEP)), []);
  const pan = useCallback((dx: number, dy: number) => setViewport((v) => panBy(v, dx, dy)), []);
  return { viewport, zoomAt, pan };
}
