// The Khronos glTF Validator's npm build ships no types; this covers what the tests call.
declare module 'gltf-validator' {
  export interface ValidationReport {
    issues: { numErrors: number; numWarnings: number; messages: { code: string; message: string; severity: number; pointer?: string }[] };
    info?: Record<string, unknown>;
  }
  export function validateBytes(data: Uint8Array, options?: { uri?: string; format?: 'gltf' | 'glb'; maxIssues?: number }): Promise<ValidationReport>;
}
