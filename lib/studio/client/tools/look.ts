// "Turn & pick": the pointer turns the view; a click on bare surface drops the selection. (Markers
// are picked and dragged with every tool, see session.ts.)
import { clickTool } from './clicks';

export const lookTool = clickTool(
  { id: 'look', label: 'Turn & pick', shortcut: 'V', hint: 'Drag to turn the view, right-drag to slide it, scroll to come closer. Press a marker to pick it; drag it to move it.' },
  () => ({ changes: [{ type: 'select', feature: null }] }),
);
