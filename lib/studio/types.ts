// The shapes the studio's route handlers answer with (docs/studio-api.md). Types only, so the
// studio's client code can import them without pulling in anything of the server.
import type { ComponentFacts, Problem } from '../field';
import type { GroomSpec, MapSpec, TransferReport } from '../groom';
import { EXPORT_FORMATS, type ExportFormat } from '../groom/export/formats';

export const SURFACE_UNITS = ['mm', 'cm', 'm', 'in'] as const;
export type SurfaceUnits = (typeof SURFACE_UNITS)[number];

export const SURFACE_FORMATS = ['obj', 'ply', 'stl', 'gltf', 'glb'] as const;
export type SurfaceFileFormat = (typeof SURFACE_FORMATS)[number];

/** The export formats are lib/groom's (its table is plain data, safe in the browser). */
export { EXPORT_FORMATS, type ExportFormat };

export type { Problem as SurfaceProblem };

/** Dates travel as ISO 8601 strings. */
export type IsoDate = string;

export type UploadTicket = {
  uploadId: string;
  /** Presigned PUT to object storage; send the file's bytes as the body. */
  url: string;
  method: 'PUT';
  expiresAt: IsoDate;
  maxBytes: number;
};

/** A surface is checked by a job after registration: `checking`, then `ready` or `refused`. */
export type SurfaceState = 'checking' | 'ready' | 'refused';

type SurfaceBase = {
  id: string;
  name: string;
  fileName: string;
  format: SurfaceFileFormat;
  units: SurfaceUnits;
  /** Presigned GET of a front view (WebP), valid 10 minutes; null while none is stored. */
  thumbnailUrl: string | null;
  createdAt: IsoDate;
  /** Where the check is, in plain words, and how far along (0–1); "checked" and 1 once it ended. */
  check: { stage: string; progress: number };
};

/** A surface that passed the check, with the facts that matter for grooming. */
export type ReadySurface = SurfaceBase & {
  state: 'ready';
  vertexCount: number;
  faceCount: number;
  componentCount: number;
  boundaryLoopCount: number;
  genus: number;
  eulerCharacteristic: number;
  areaCm2: number;
  groups: string[];
  /**
   * Whether every corner of the file has a UV, and the fraction of the UV map used twice (0 when
   * no UVs overlap; an overlap is also among the warnings); null for surfaces checked before
   * UVs were read.
   */
  uvs: { present: boolean; overlapFraction: number } | null;
  /** Problems of severity `warning` that did not stop the surface from being accepted. */
  warnings: Problem[];
};

/** A surface still being checked, or refused with the problems found (errors first). */
export type UncheckedSurface = SurfaceBase & { state: 'checking' | 'refused'; problems: Problem[] };

export type SurfaceSummary = ReadySurface | UncheckedSurface;

export type SurfaceDetail = ReadySurface & {
  /** Presigned GET of the surface file as uploaded, valid 10 minutes. */
  fileUrl: string;
  /**
   * The surface read and welded once, by its check (lib/field's prepared form): what the editor
   * opens, copying arrays instead of parsing the file; immutable and cached by the browser. Null
   * for surfaces checked before it existed (the editor reads `fileUrl` then). `fileName` ends with
   * `.wwsurf`, which is how the reader knows it.
   */
  prepared: { url: string; fileName: string } | null;
  byteSize: number;
  /** Per connected piece: faces, vertices, edges, boundary loops, Euler characteristic, genus. */
  components: ComponentFacts[];
};

export type Version = {
  id: string;
  number: number;
  name: string;
  /** The surface the version was made on: restoring it opens the groom on that surface again. */
  surfaceId: string;
  createdAt: IsoDate;
  /** The version's own thumbnail once the job has rendered it, else null. */
  thumbnailUrl: string | null;
};

export type GroomSummary = {
  id: string;
  name: string;
  surfaceId: string;
  surfaceName: string;
  revision: number;
  versionCount: number;
  latestVersion: { number: number; name: string } | null;
  /** The groom's last rendered thumbnail, or its surface's until one is rendered; null if neither. */
  thumbnailUrl: string | null;
  updatedAt: IsoDate;
  /** Set when the groom was fitted from a bought preset: it may be used under that licence, never offered for sale. */
  fromPurchaseId: string | null;
};

export type GroomDetail = GroomSummary & {
  /** The saved spec, resolved: every default filled in. */
  spec: GroomSpec;
  savedAt: IsoDate;
  surface: SurfaceDetail;
  /**
   * The earlier sculpt the guides' roots are sampled on (a groom moved onto a new sculpt by
   * polygon keeps its guides' ids, polygons and weights), or null: the editor grows its preview
   * from it, as exports do. `fileUrl` is a presigned GET valid 10 minutes.
   */
  rootsSurface: { id: string; fileName: string; fileUrl: string } | null;
  /** Newest first. */
  versions: Version[];
};

export type ExportStatus = 'queued' | 'running' | 'done' | 'failed';

export type ExportJob = {
  id: string;
  groomId: string;
  format: ExportFormat;
  status: ExportStatus;
  /** 0 to 1. */
  progress: number;
  /** Plain words for what the job is doing: "waiting in the queue", "solving the field", … */
  stage: string;
  /** Why the export failed, in plain words; null unless `status` is `failed`. */
  error: string | null;
  fileName: string;
  /** Presigned GET (10 minutes) that downloads as `fileName`; null until `status` is `done`. */
  downloadUrl: string | null;
  /** The spec revision the file is made from. */
  specRevision: number;
  /** Whether the growth surface is written beside the guides (USD, glTF and OBJ). */
  withSurface: boolean;
  createdAt: IsoDate;
};

export type UploadResponse = UploadTicket;
export type SurfaceResponse = { surface: SurfaceSummary };
export type SurfaceListResponse = { surfaces: SurfaceSummary[] };
export type SurfaceDetailResponse = { surface: SurfaceDetail | UncheckedSurface };
export type DeletedResponse = { deleted: true };
export type GroomResponse = { groom: GroomDetail };
export type GroomListResponse = { grooms: GroomSummary[] };
export type SpecSavedResponse = { revision: number; savedAt: IsoDate };
export type VersionResponse = { version: Version };
export type VersionListResponse = { versions: Version[] };
export type RestoredResponse = { spec: GroomSpec; surfaceId: string; revision: number; savedAt: IsoDate };
export type ExportResponse = { export: ExportJob };

/** Moving a groom onto another surface (or starting one there from it): where, and how to carry its places. */
export type SurfaceMoveInput = {
  surfaceId: string;
  /** Three or more pairs of the same place on the old and the new surface, each in its own file's coordinates. */
  landmarks?: { from: [number, number, number]; to: [number, number, number] }[];
  /** Old region (group) name → the new surface's name for it. */
  regionMap?: Record<string, string>;
  method?: 'auto' | 'topology' | 'uv' | 'alignment';
  /** The preview whose transfer to take (`SurfaceMovePreview.moveId`), so that it is not carried over again; ignored unless the input is the same. */
  moveId?: string;
};
export type SurfaceMovePreview = {
  report: TransferReport;
  /** Send it back with the same input to accept this transfer (kept for an hour). */
  moveId: string;
  /** The groom's revision the report was made from: accepting sends it back. */
  revision: number;
  from: { id: string; name: string };
  to: { id: string; name: string };
};
export type SurfaceMovePreviewResponse = { preview: SurfaceMovePreview };
/** A painted map read from an image through a surface's UVs, ready to go into a spec's `maps`. */
export type ImageMapResponse = { map: MapSpec };
