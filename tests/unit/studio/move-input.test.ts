// The Surface panel's typed inputs: renamed regions and landmark pairs.
import { describe, expect, it } from 'vitest';
import { landmarkLine, readMoveInputs } from '@/lib/studio/client/move-input';

describe('readMoveInputs', () => {
  it('reads region renames and landmark pairs, ignoring blank lines', () => {
    expect(readMoveInputs('scalp = crown\n\n chin=jaw ', '0 1 0 = 0 0 2.54\n1, 0, 0 = 2.54 0 0\n')).toEqual({
      regionMap: { scalp: 'crown', chin: 'jaw' },
      landmarks: [
        { from: [0, 1, 0], to: [0, 0, 2.54] },
        { from: [1, 0, 0], to: [2.54, 0, 0] },
      ],
    });
    expect(readMoveInputs('', '  ')).toEqual({});
  });

  it('names the first line it cannot read', () => {
    expect(readMoveInputs('scalp', '')).toEqual({ problem: 'Write each renamed region as old=new (“scalp” is not).' });
    expect(readMoveInputs('', '0 1 = 0 0 1')).toEqual({ problem: "Write each landmark as the old surface's x y z = the new surface's x y z (“0 1 = 0 0 1” is not)." });
  });
});

describe('landmarkLine', () => {
  it('writes a clicked pair as a line the landmarks box reads back, to six significant digits', () => {
    const line = landmarkLine([0.123456789, -12.3456789, 1e-7], [2540, 0, -0.5]);
    expect(line).toBe('0.123457 -12.3457 1e-7 = 2540 0 -0.5');
    expect(readMoveInputs('', `${line}\n${line}`)).toEqual({ landmarks: [0, 1].map(() => ({ from: [0.123457, -12.3457, 1e-7], to: [2540, 0, -0.5] })) });
  });
});
