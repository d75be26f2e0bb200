'use client';
// A polyline drawn a few pixels wide whatever the zoom: partings, crests, flow strokes and a path
// being drawn. (Plain WebGL lines are one pixel wide.)
import { useThree } from '@react-three/fiber';
import { useEffect, useMemo } from 'react';
import { Line2 } from 'three/examples/jsm/lines/Line2.js';
import { LineGeometry } from 'three/examples/jsm/lines/LineGeometry.js';
import { LineMaterial } from 'three/examples/jsm/lines/LineMaterial.js';

export function FatLine({ points, colour, width = 3, dashed = false, onClick }: { points: Float32Array | number[]; colour: string; width?: number; dashed?: boolean; onClick?: () => void }) {
  const size = useThree((state) => state.size);
  const invalidate = useThree((state) => state.invalidate);
  const line = useMemo(() => {
    const material = new LineMaterial({ color: colour, linewidth: width, dashed, dashSize: 1, gapSize: 1, worldUnits: false });
    return new Line2(new LineGeometry(), material);
  }, [colour, dashed, width]);

  useEffect(() => {
    if (points.length < 6) {
      line.visible = false;
    } else {
      line.visible = true;
      line.geometry.dispose();
      line.geometry = new LineGeometry();
      line.geometry.setPositions(points instanceof Float32Array ? points : Float32Array.from(points));
      if (dashed) {
        line.computeLineDistances();
        const box = line.geometry.boundingSphere;
        const dash = (box?.radius ?? 1) / 40;
        line.material.dashSize = dash;
        line.material.gapSize = dash * 0.7;
      }
    }
    invalidate();
  }, [dashed, invalidate, line, points]);

  useEffect(() => {
    line.material.resolution.set(size.width, size.height);
    invalidate();
  }, [invalidate, line, size]);

  useEffect(
    () => () => {
      line.geometry.dispose();
      line.material.dispose();
    },
    [line],
  );

  return <primitive object={line} onClick={onClick} />;
}
