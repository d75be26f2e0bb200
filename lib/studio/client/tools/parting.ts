// The parting tool: a parting drawn from clicked points (see curves.ts).
import { curveTool } from './curves';

export const partingTool = curveTool('parting', { label: 'Parting', shortcut: 'P' });
