import { describe, expect, it } from 'vitest';
import { icosphere } from '@/tests/fixtures/shapes';
import { EXPORT_EXTENSIONS, EXPORT_FORMAT_FACTS, EXPORT_FORMATS, formatOfExtension, type ExportSource } from '@/lib/groom/export/formats';
import { writeExport, type GroomMade } from '@/lib/groom/export/write';
import { groomOn } from './support';

const tiny = () =>
  groomOn(icosphere(2, 1), {
    specVersion: 2,
    units: 'cm',
    field: { singularities: [{ point: [0, 1, 0], index: 1 }, { point: [0, -1, 0], index: 1, twist: 180 }] },
    guides: { count: 12, length: 0.3, pointsPerGuide: 4 },
  });

/** Only what a format's source names, as the studio's export job gives it. */
function madeFor(source: ExportSource, groom: ReturnType<typeof tiny>): GroomMade {
  const { spec, surface, solved, guides } = groom;
  return source === 'spec' ? { spec } : source === 'field' ? { spec, surface, solved } : { spec, surface, solved, guides };
}

describe('the export format table', () => {
  it('writes every format, from no more than its source names, as a non-empty file', () => {
    const groom = tiny();
    expect(groom.guides.count).toBe(12);
    for (const format of EXPORT_FORMATS) {
      const file = writeExport(format, madeFor(EXPORT_FORMAT_FACTS[format].source, groom));
      expect(file.length, format).toBeGreaterThan(0);
    }
  });

  it('tells a caller who gave too little, instead of writing an empty file', () => {
    const { spec } = tiny();
    expect(() => writeExport('glb', { spec })).toThrow(/grown guides/);
    expect(() => writeExport('ply', { spec })).toThrow(/solved field/);
  });

  it('gives each format its own file ending: unique extensions, variants told apart by their word', () => {
    const plain = EXPORT_FORMATS.filter((format) => !EXPORT_FORMAT_FACTS[format].variant);
    const extensions = plain.map((format) => EXPORT_FORMAT_FACTS[format].extension);
    expect(new Set(extensions).size).toBe(extensions.length);
    expect(EXPORT_EXTENSIONS).toEqual(extensions);
    const endings = EXPORT_FORMATS.map((format) => `${EXPORT_FORMAT_FACTS[format].variant ?? ''}${EXPORT_FORMAT_FACTS[format].extension}`);
    expect(new Set(endings).size).toBe(EXPORT_FORMATS.length);
    for (const format of EXPORT_FORMATS) {
      const { extension, mediaType, label } = EXPORT_FORMAT_FACTS[format];
      expect(extension).toMatch(/^\.[a-z]+$/);
      expect(mediaType).toMatch(/^[a-z]+\/[a-z+.-]+/);
      expect(label).toContain(`(${extension})`);
    }
  });

  it('finds a format by its extension and back, whatever the case or dot; a variant by its plain format', () => {
    for (const extension of EXPORT_EXTENSIONS) {
      const format = formatOfExtension(extension)!;
      expect(EXPORT_FORMAT_FACTS[format].extension).toBe(extension);
      expect(formatOfExtension(extension.toUpperCase())).toBe(format);
      expect(formatOfExtension(extension.slice(1))).toBe(format);
    }
    expect(formatOfExtension(EXPORT_FORMAT_FACTS['usda-bspline'].extension)).toBe('usda');
    expect(formatOfExtension('.fbx')).toBeUndefined();
    expect(formatOfExtension('')).toBeUndefined();
  });
});
