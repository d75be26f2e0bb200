'use client';
// The listing's guides in 3D: the public preview asset the listing exposes (a GLB holding at most
// a tenth of its guides, a few points each, as line primitives, without widths or binding: see
// previewGuides in lib/groom), framed to fit, coloured from root to tip, turned with the pointer
// (drag to orbit, wheel to zoom).
import { Canvas, useFrame, useThree } from '@react-three/fiber';
import { useEffect, useMemo, useState } from 'react';
import * as THREE from 'three';
import { GLTFLoader } from 'three/examples/jsm/loaders/GLTFLoader.js';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';

type Loaded =
  | { state: 'loading' }
  | { state: 'failed'; message: string }
  | { state: 'ready'; scene: THREE.Object3D; guideCount: number; radius: number };

const ROOT_COLOUR = new THREE.Color('#8e3f1d');
const TIP_COLOUR = new THREE.Color('#e9bb4d');

/**
 * Colours a LINES primitive from root (bracken) to tip (pollen). The index pairs join the
 * consecutive points of each guide, so a point's step is one more than its predecessor's and
 * roots are the points nothing leads to. Returns how many guides the primitive holds.
 */
function colourGuides(lines: THREE.LineSegments): number {
  const geometry = lines.geometry as THREE.BufferGeometry;
  const position = geometry.getAttribute('position');
  const index = geometry.getIndex();
  const count = position.count;
  const step = new Int32Array(count);
  const hasPredecessor = new Uint8Array(count);
  const pairs = index ? index.array : Array.from({ length: count }, (_, i) => i);
  for (let k = 0; k + 1 < pairs.length; k += 2) {
    step[pairs[k + 1]] = step[pairs[k]] + 1;
    hasPredecessor[pairs[k + 1]] = 1;
  }
  let longest = 1;
  let guides = 0;
  for (let i = 0; i < count; i++) {
    if (step[i] > longest) longest = step[i];
    if (!hasPredecessor[i]) guides += 1;
  }
  const colours = new Float32Array(3 * count);
  const colour = new THREE.Color();
  for (let i = 0; i < count; i++) {
    colour.lerpColors(ROOT_COLOUR, TIP_COLOUR, step[i] / longest);
    colours.set([colour.r, colour.g, colour.b], 3 * i);
  }
  geometry.setAttribute('color', new THREE.BufferAttribute(colours, 3));
  lines.material = new THREE.LineBasicMaterial({ vertexColors: true });
  return guides;
}

async function loadPreview(url: string): Promise<Loaded> {
  const gltf = await new GLTFLoader().loadAsync(url);
  const scene = gltf.scene;
  let guideCount = 0;
  scene.traverse((object) => {
    if ((object as THREE.LineSegments).isLineSegments) guideCount += colourGuides(object as THREE.LineSegments);
    else if ((object as THREE.Mesh).isMesh) {
      (object as THREE.Mesh).material = new THREE.MeshStandardMaterial({ color: '#ece5d4', roughness: 0.9 });
    }
  });
  const box = new THREE.Box3().setFromObject(scene);
  if (box.isEmpty()) return { state: 'failed', message: 'The preview holds no guides.' };
  const centre = box.getCenter(new THREE.Vector3());
  const radius = box.getBoundingSphere(new THREE.Sphere()).radius || 1;
  // Centred on the origin, so the orbit turns about the middle of the groom.
  const holder = new THREE.Group();
  scene.position.sub(centre);
  holder.add(scene);
  return { state: 'ready', scene: holder, guideCount, radius };
}

function Orbit({ radius }: { radius: number }) {
  const { camera, gl } = useThree();
  const controls = useMemo(() => new OrbitControls(camera, gl.domElement), [camera, gl]);
  useEffect(() => {
    camera.position.set(radius * 1.6, radius * 0.9, radius * 2.2);
    (camera as THREE.PerspectiveCamera).near = radius / 100;
    (camera as THREE.PerspectiveCamera).far = radius * 100;
    camera.updateProjectionMatrix();
    controls.enableDamping = true;
    controls.minDistance = radius * 0.3;
    controls.maxDistance = radius * 10;
    controls.target.set(0, 0, 0);
    controls.update();
    return () => controls.dispose();
  }, [camera, controls, radius]);
  useFrame(() => controls.update());
  return null;
}

export function GuidePreview({ url, title }: { url: string | null; title: string }) {
  const [loaded, setLoaded] = useState<Loaded>({ state: 'loading' });

  useEffect(() => {
    if (!url) return;
    let current = true;
    setLoaded({ state: 'loading' });
    loadPreview(url)
      .then((result) => current && setLoaded(result))
      .catch(() => current && setLoaded({ state: 'failed', message: 'The 3D preview could not be loaded.' }));
    return () => {
      current = false;
    };
  }, [url]);

  if (!url) {
    return <p className="rounded-3xl bg-vellum p-6 text-loam-soft">This preset has no 3D preview yet.</p>;
  }
  return (
    <figure className="flex flex-col gap-2" data-testid="guide-preview" data-preview-state={loaded.state}>
      <div className="relative aspect-[4/3] overflow-hidden rounded-3xl bg-tarn-deep">
        {loaded.state === 'ready' ? (
          <Canvas
            aria-label={`3D preview of the guides of ${title}`}
            role="img"
            camera={{ fov: 40 }}
            dpr={[1, 2]}
            gl={{ antialias: true, preserveDrawingBuffer: true }}
          >
            <color attach="background" args={['#173236']} />
            <ambientLight intensity={0.7} />
            <directionalLight position={[2, 3, 4]} intensity={1.6} />
            <primitive object={loaded.scene} />
            <Orbit radius={loaded.radius} />
          </Canvas>
        ) : (
          <p className="absolute inset-0 flex items-center justify-center p-6 text-center text-chalk/80">
            {loaded.state === 'loading' ? 'Loading the guides…' : loaded.message}
          </p>
        )}
      </div>
      <figcaption className="text-sm text-loam-soft">
        {loaded.state === 'ready'
          ? `${loaded.guideCount.toLocaleString('en-GB')} guides shown, coloured from root to tip: at most a tenth of the preset’s guides, a few points each. The full guides come only in the package. Drag to turn, scroll to zoom.`
          : 'At most a tenth of the preset’s guides, a few points each; the full guides come only in the package.'}
      </figcaption>
    </figure>
  );
}
