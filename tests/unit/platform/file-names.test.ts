// File names made from typed names: what downloads and package folders are called.
import { describe, expect, it } from 'vitest';
import { fileSlug } from '@/lib/platform/file-names';

describe('fileSlug', () => {
  it('keeps letters and digits, drops accents, joins the rest with single dashes', () => {
    expect(fileSlug('Bramble — autumn coat', 80, 'groom')).toBe('bramble-autumn-coat');
    expect(fileSlug('  Brisquette: short velvet (v2)!  ', 80, 'groom')).toBe('brisquette-short-velvet-v2');
    expect(fileSlug('Crème brûlée ruff', 80, 'groom')).toBe('creme-brulee-ruff');
  });

  it('cuts to the length without leaving a dash at the end, and falls back when nothing is left', () => {
    expect(fileSlug('tawny fox crown', 10, 'preset')).toBe('tawny-fox');
    expect(fileSlug('——', 10, 'preset')).toBe('preset');
    expect(fileSlug('狐の冠', 10, 'preset')).toBe('preset');
  });
});
