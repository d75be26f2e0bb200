'use client';
// Many thin line segments in one draw call — the field's strokes or streamlines, guides, the
// surface border — shaded from one colour at each line's tail to another at its head, so the
// direction of the flow reads at a glance. Updates reuse the buffers when the size allows, and
// fill the colours again only when they change.
import { useThree } from '@react-three/fiber';
import { useEffect, useLayoutEffect, useMemo, useRef } from 'react';
import { BufferAttribute, BufferGeometry, Color, DynamicDrawUsage, type LineSegments } from 'three';

export function LineLayer({
  lines,
  shade,
  colours,
  tail,
  head,
  opacity = 1,
  depthTest = true,
  onDrawn,
  name,
}: {
  /** Segment end points: x, y, z of the tail, then of the head, for each segment. */
  lines: Float32Array;
  /** Per end point, 0 (tail colour) to 1 (head colour); without it, tails and heads alternate. */
  shade?: Float32Array | null;
  /** Per end point r, g, b (0–1), instead of shading between `tail` and `head` (guide sets, each in its own colours). */
  colours?: Float32Array | null;
  tail: string;
  head: string;
  opacity?: number;
  depthTest?: boolean;
  /** Called after the frame that first shows these lines has been drawn. */
  onDrawn?: () => void;
  name?: string;
}) {
  const invalidate = useThree((state) => state.invalidate);
  const geometry = useMemo(() => new BufferGeometry(), []);
  const object = useRef<LineSegments>(null);
  const pendingDrawn = useRef(false);
  /** What the colour attribute was last filled from (its first `count` points). */
  const coloured = useRef<{ attribute: BufferAttribute; count: number; shade: Float32Array | null; colours: Float32Array | null; tail: string; head: string } | null>(null);

  useLayoutEffect(() => {
    const count = lines.length / 3;
    let position = geometry.getAttribute('position') as BufferAttribute | undefined;
    let colour = geometry.getAttribute('color') as BufferAttribute | undefined;
    if (!position || position.array.length < lines.length) {
      // Room to grow, in whole vertices: a capacity that is not a multiple of 3 gives the
      // attribute a fractional count, and three reads the last, partial vertex as NaN.
      const capacity = 3 * Math.ceil(count * 1.25);
      position = new BufferAttribute(new Float32Array(capacity), 3).setUsage(DynamicDrawUsage);
      colour = new BufferAttribute(new Float32Array(capacity), 3).setUsage(DynamicDrawUsage);
      geometry.setAttribute('position', position);
      geometry.setAttribute('color', colour);
    }
    (position.array as Float32Array).set(lines);
    position.needsUpdate = true;
    // The colours only when they change: a field dragged with short strokes keeps its count and
    // alternating shade, so each update uploads the positions alone.
    const was = coloured.current;
    if (!was || was.attribute !== colour || was.count < count || was.shade !== shade || was.colours !== colours || was.tail !== tail || was.head !== head) {
      const a = new Color(tail), b = new Color(head);
      const c = colour!.array as Float32Array;
      if (colours) c.set(colours);
      else for (let i = 0; i < count; i++) {
        const t = shade ? shade[i] : i % 2;
        c[3 * i] = a.r + (b.r - a.r) * t;
        c[3 * i + 1] = a.g + (b.g - a.g) * t;
        c[3 * i + 2] = a.b + (b.b - a.b) * t;
      }
      colour!.needsUpdate = true;
      coloured.current = { attribute: colour!, count, shade: shade ?? null, colours: colours ?? null, tail, head };
    }
    geometry.setDrawRange(0, count);
    geometry.computeBoundingSphere();
    pendingDrawn.current = true;
    invalidate();
  }, [colours, geometry, head, invalidate, lines, shade, tail]);

  useEffect(() => () => geometry.dispose(), [geometry]);

  return (
    <lineSegments
      ref={object}
      name={name}
      geometry={geometry}
      frustumCulled={false}
      raycast={() => undefined}
      onAfterRender={() => {
        if (!pendingDrawn.current) return;
        pendingDrawn.current = false;
        onDrawn?.();
      }}
    >
      <lineBasicMaterial vertexColors transparent={opacity < 1} opacity={opacity} depthTest={depthTest} />
    </lineSegments>
  );
}
