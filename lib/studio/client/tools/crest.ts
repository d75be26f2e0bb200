// The crest tool: a crest drawn from clicked points (see curves.ts).
import { curveTool } from './curves';

export const crestTool = curveTool('crest', { label: 'Crest', shortcut: 'C' });
