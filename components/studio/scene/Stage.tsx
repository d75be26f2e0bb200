'use client';
// The 3D stage every studio view draws in: a @react-three/fiber canvas that renders only when
// something changed, lit from the camera, with orbit (left drag), pan (right drag or shift-drag)
// and zoom (wheel), and a small API for the page: frame everything, look at a point, and find
// the surface point under a spot of the view.
import { Canvas, useThree } from '@react-three/fiber';
import { useEffect, useMemo, type ReactNode, type RefObject } from 'react';
import { DirectionalLight, MOUSE, Raycaster, Vector2, Vector3, type Object3D, type PerspectiveCamera } from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import type { Vec3 } from '@/lib/studio/client/features';

export const STAGE_BACKGROUND = '#173236';

export interface SurfacePick {
  readonly point: Vec3;
  readonly face: number;
}

export interface StageApi {
  frameAll(): void;
  lookAt(point: Vec3, normal: Vec3): void;
  /** The surface point under a spot of the view (0–1 across, 0–1 down), or null when it shows no surface. */
  pickAt(x: number, y: number): SurfacePick | null;
  /** While a feature is dragged or a stroke drawn, the view must not turn. */
  setNavigation(enabled: boolean): void;
}

export interface StageProps {
  center: Vec3;
  radius: number;
  upAxis: 'y' | 'z';
  apiRef: RefObject<StageApi | null>;
  /** The object picks look at (the surface mesh). */
  pickTarget: RefObject<Object3D | null>;
  children: ReactNode;
  label: string;
  className?: string;
  /**
   * Draw cheaper (fewer pixels) while a marker is dragged: with software WebGL every frame's cost,
   * and its read-back to the page, grows with the pixels; the full pixel ratio comes back on release.
   */
  lighter?: boolean;
}

/** The pixel ratio the stage draws at while `lighter` (the drag bench may set `window.whorlwindDragPixelRatio` to compare). */
export const DRAG_PIXEL_RATIO = 0.5;

function dragPixelRatio(): number {
  const chosen = typeof window === 'undefined' ? undefined : (window as { whorlwindDragPixelRatio?: unknown }).whorlwindDragPixelRatio;
  return typeof chosen === 'number' && chosen > 0 && chosen <= 1 ? chosen : DRAG_PIXEL_RATIO;
}

/** A change of the pixel ratio clears the canvas: it is drawn again at once. */
function RedrawOn({ ratio }: { ratio: number }) {
  const invalidate = useThree((state) => state.invalidate);
  useEffect(() => invalidate(), [invalidate, ratio]);
  return null;
}

function CameraRig({ center, radius, upAxis, apiRef, pickTarget }: Omit<StageProps, 'children' | 'label' | 'className'>) {
  const camera = useThree((state) => state.camera) as PerspectiveCamera;
  const gl = useThree((state) => state.gl);
  const invalidate = useThree((state) => state.invalidate);
  const controls = useMemo(() => {
    camera.up.set(0, upAxis === 'z' ? 0 : 1, upAxis === 'z' ? 1 : 0);
    const orbit = new OrbitControls(camera, gl.domElement);
    orbit.enableDamping = false;
    orbit.mouseButtons = { LEFT: MOUSE.ROTATE, MIDDLE: MOUSE.DOLLY, RIGHT: MOUSE.PAN };
    orbit.zoomToCursor = true;
    return orbit;
  }, [camera, gl, upAxis]);

  useEffect(() => {
    const onChange = () => invalidate();
    controls.addEventListener('change', onChange);
    return () => {
      controls.removeEventListener('change', onChange);
      controls.dispose();
    };
  }, [controls, invalidate]);

  useEffect(() => {
    const c = new Vector3(...center);
    const frame = () => {
      const distance = (radius / Math.sin(((camera.fov / 2) * Math.PI) / 180)) * 1.05;
      // A Y-up character faces +Z, a Z-up one −Y: look at its front, a little from above.
      const direction = upAxis === 'z' ? new Vector3(0.25, -1, 0.3) : new Vector3(0.25, 0.3, 1);
      camera.position.copy(c).addScaledVector(direction.normalize(), distance);
      camera.near = radius / 200;
      camera.far = radius * 40;
      camera.updateProjectionMatrix();
      controls.target.copy(c);
      controls.minDistance = radius * 0.05;
      controls.maxDistance = radius * 12;
      controls.update();
      invalidate();
    };
    const raycaster = new Raycaster();
    raycaster.firstHitOnly = true;
    apiRef.current = {
      frameAll: frame,
      lookAt(point, normal) {
        const target = new Vector3(...point);
        const n = new Vector3(...normal);
        if (n.lengthSq() === 0) n.set(0, 0, 1);
        const distance = Math.max(camera.position.distanceTo(controls.target) * 0.6, radius * 0.6);
        camera.position.copy(target).addScaledVector(n.normalize(), distance);
        controls.target.copy(target);
        controls.update();
        invalidate();
      },
      pickAt(x, y) {
        const target = pickTarget.current;
        if (!target) return null;
        raycaster.setFromCamera(new Vector2(2 * x - 1, 1 - 2 * y), camera);
        const hit = raycaster.intersectObject(target, false)[0];
        if (!hit || hit.faceIndex == null) return null;
        return { point: [hit.point.x, hit.point.y, hit.point.z], face: hit.faceIndex };
      },
      setNavigation(enabled) {
        controls.enabled = enabled;
      },
    };
    frame();
    return () => {
      apiRef.current = null;
    };
  }, [apiRef, camera, center, controls, invalidate, pickTarget, radius, upAxis]);

  return null;
}

export function Stage({ children, label, className = '', lighter = false, ...rig }: StageProps) {
  const ratio = lighter ? dragPixelRatio() : 1;
  return (
    <div className={`relative h-full w-full ${className}`} role="img" aria-label={label}>
      <Canvas
        frameloop="demand"
        dpr={ratio}
        camera={{ fov: 35, position: [0, 0, 10] }}
        // Every frame matters while a feature is dragged: no multisampling, no kept buffer, and the
        // page's own colour handling (no tone mapping pass) — software renderers pay for each.
        gl={{ antialias: false, preserveDrawingBuffer: false, powerPreference: 'high-performance' }}
        flat
        onContextMenu={(event) => event.preventDefault()}
        style={{ background: STAGE_BACKGROUND, touchAction: 'none' }}
      >
        <hemisphereLight args={['#f6f2e9', '#4a4038', 1.1]} />
        <CameraLight />
        <CameraRig {...rig} />
        <RedrawOn ratio={ratio} />
        {children}
      </Canvas>
    </div>
  );
}

/** A light that sits at the camera, so the side being looked at is always lit. */
function CameraLight() {
  const camera = useThree((state) => state.camera);
  const scene = useThree((state) => state.scene);
  useEffect(() => {
    const light = new DirectionalLight('#fffaf0', 1.6);
    light.position.set(0.3, 0.6, 1);
    camera.add(light);
    camera.add(light.target);
    light.target.position.set(0, 0, -1);
    scene.add(camera);
    return () => {
      camera.remove(light, light.target);
      scene.remove(camera);
    };
  }, [camera, scene]);
  return null;
}
