// The studio's calls to its route handlers, exactly as docs/studio-api.md describes them, made with
// the platform's one client (typed results, never a throw), and the upload of a surface file
// straight to object storage with its progress.
import type {
  ExportFormat,
  ExportJob,
  GroomDetail,
  GroomSummary,
  SurfaceDetail,
  SurfaceProblem,
  SurfaceSummary,
  SurfaceUnits,
  UploadTicket,
  Version,
} from '@/lib/studio/types';
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { request } from '@/lib/http/client';

export { EXPORT_FORMATS, SURFACE_FORMATS, SURFACE_UNITS } from '@/lib/studio/types';
export type { ExportFormat, ExportJob, GroomDetail, GroomSummary, SurfaceDetail, SurfaceProblem, SurfaceSummary, SurfaceUnits, UploadTicket };
export type GroomVersion = Version;

export const studioApi = {
  surfacesUrl: '/api/studio/surfaces',
  groomsUrl: '/api/studio/grooms',
  groomUrl: (id: string) => `/api/studio/grooms/${encodeURIComponent(id)}`,
  versionsUrl: (id: string) => `/api/studio/grooms/${encodeURIComponent(id)}/versions`,

  requestUpload: (fileName: string, byteSize: number) => request<UploadTicket>('POST', '/api/studio/uploads', { fileName, byteSize }),
  createSurface: (input: { uploadId: string; name: string; units: SurfaceUnits }) => request<{ surface: SurfaceSummary }>('POST', '/api/studio/surfaces', input),
  deleteSurface: (id: string) => request<{ deleted: true }>('DELETE', `/api/studio/surfaces/${encodeURIComponent(id)}`),
  getSurface: (id: string) => request<{ surface: SurfaceDetail }>('GET', `/api/studio/surfaces/${encodeURIComponent(id)}`),

  createGroom: (input: { surfaceId: string; name: string }) => request<{ groom: GroomSummary }>('POST', '/api/studio/grooms', input),
  renameGroom: (id: string, name: string) => request<{ groom: GroomSummary }>('PATCH', studioApi.groomUrl(id), { name }),
  duplicateGroom: (id: string, name?: string) => request<{ groom: GroomSummary }>('POST', `${studioApi.groomUrl(id)}/duplicate`, name ? { name } : {}),
  deleteGroom: (id: string) => request<{ deleted: true }>('DELETE', studioApi.groomUrl(id)),
  saveSpec: (id: string, spec: GroomSpec, baseRevision: number) => request<{ revision: number; savedAt: string }>('PUT', `${studioApi.groomUrl(id)}/spec`, { spec, baseRevision }),

  listVersions: (id: string) => request<{ versions: GroomVersion[] }>('GET', studioApi.versionsUrl(id)),
  createVersion: (id: string, name: string) => request<{ version: GroomVersion }>('POST', studioApi.versionsUrl(id), { name }),
  restoreVersion: (id: string, versionId: string) => request<{ spec: GroomSpec; surfaceId: string; revision: number }>('POST', `${studioApi.versionsUrl(id)}/${encodeURIComponent(versionId)}/restore`),

  startExport: (id: string, format: ExportFormat, options: { withSurface?: boolean } = {}) =>
    request<{ export: ExportJob }>('POST', `${studioApi.groomUrl(id)}/exports`, { format, ...(options.withSurface ? { withSurface: true } : {}) }),
  getExport: (exportId: string) => request<{ export: ExportJob }>('GET', `/api/studio/exports/${encodeURIComponent(exportId)}`),
};

/**
 * Sends a file to object storage with the presigned PUT, reporting progress (0–1) as the browser
 * sends it. Resolves with null on success or with a plain-words reason.
 */
export function uploadFile(ticket: UploadTicket, file: Blob, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<string | null> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open(ticket.method, ticket.url);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress(event.loaded / event.total);
    };
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) {
        onProgress(1);
        resolve(null);
      } else {
        resolve(`The file store refused the upload (it answered ${xhr.status}). Try again; if it keeps happening the upload link may have expired.`);
      }
    };
    xhr.onerror = () => resolve('The upload was interrupted: the file store could not be reached. Check your connection and try again.');
    xhr.onabort = () => resolve('The upload was cancelled.');
    signal?.addEventListener('abort', () => xhr.abort());
    xhr.send(file);
  });
}

/** A byte count in the units people read ("12.4 MB", "200 MB"). */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} bytes`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes;
  let unit = -1;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit++;
  }
  return `${value >= 100 || Number.isInteger(value) ? Math.round(value) : value.toFixed(1)} ${units[unit]}`;
}

/** The extension of a file name, lower case, or '' (`Fox.OBJ` → `obj`). */
export function extensionOf(fileName: string): string {
  const dot = fileName.lastIndexOf('.');
  return dot < 0 ? '' : fileName.slice(dot + 1).toLowerCase();
}
