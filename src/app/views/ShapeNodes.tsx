import { Line, Rect, Text } from 'react-konva';
import type { Shape } from '../draw';

/** Renders the draw module's shape descriptors as Konva nodes, as they are. */
export function ShapeNodes({ shapes }: { readonly shapes: readonly Shape[] }) {
  return (
    <>
      {shapes.map((s) => {
        switch (s.kind) {
          case 'rect':
            return (
              <Rect
                key={s.id}
                x={s.x}
                y={s.y}
                width={s.width}
                height={s.height}
                fill={s.fill}
                stroke={s.stroke}
                strokeWidth={s.strokeWidth}
                dash={s.dash ? [...s.dash] : undefined}
                opacity={s.opacity}
                listening={false}
                perfectDrawEnabled={false}
              />
            );
          case 'line':
            return (
              <Line
                key={s.id}
                points={[...s.points]}
                stroke={s.stroke}
                strokeWidth={s.strokeWidth}
                dash={s.dash ? [...s.dash] : undefined}
                opacity={s.opacity}
                listening={false}
              />
            );
          case 'text':
            return (
              <Text
                key={s.id}
                x={s.x}
                y={s.y}
                text={s.text}
                fontSize={s.fontSize}
                fill={s.fill}
                align={s.align}
                listening={false}
                shadowColor="#000"
                shadowBlur={2}
                shadowOpacity={0.9}
              />
            );
        }
      })}
    </>
  );
}
